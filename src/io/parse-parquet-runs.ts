import { parquetMetadata, parquetRead } from 'hyparquet';
import { decompress as zstdDecompress } from 'fzstd';
import { InputError, quote } from '../errors.js';
import { buildRunsTable } from './build-runs-table.js';
import { MAX_TABLE_COLUMNS } from './parse-csv.js';
import { resolveKeyColumns } from './resolve-key-columns.js';
import type { InputColumn, ReadRunsOptions, RunsTable } from './runs-table.js';

type ParquetValue = string | number | bigint | boolean | Date | null | undefined | object;

/**
 * Reads a runs table from Parquet bytes (hyparquet; SNAPPY, zstd or uncompressed pages — the pyarrow default is
 * SNAPPY). Columns are decoded whole (flat columns only); text stays text, integers and floats numbers,
 * 64-bit integers bigints, timestamps `Date`s (usable with `--time-col`; refused as a plain step column).
 * Messages locate rows as `row N`, counting data rows from 1.
 */
export async function runsFromParquet(bytes: Uint8Array, source: string, options: ReadRunsOptions): Promise<RunsTable> {
  if (bytes.length === 0) throw new InputError(`${source}: file must be Parquet, got an empty file`);
  const file = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let names: string[];
  let nRows: number;
  const data = new Map<string, ParquetValue[][]>();
  try {
    const metadata = parquetMetadata(file);
    names = metadata.schema.slice(1).filter((s) => !s.num_children).map((s) => s.name);
    nRows = Number(metadata.num_rows);
    if (names.length > MAX_TABLE_COLUMNS) {
      throw new InputError(`${source}: table must have at most ${MAX_TABLE_COLUMNS} columns, got ${names.length}`);
    }
    for (const name of names) data.set(name, []);
    await parquetRead({
      file,
      metadata,
      // zstd pages (pandas/pyarrow `compression="zstd"`, underfoot's own `--compression zstd`) via fzstd.
      compressors: { ZSTD: (input: Uint8Array) => zstdDecompress(input) },
      onChunk: (chunk) => {
        const parts = data.get(chunk.columnName);
        if (parts) parts[chunk.rowStart] = Array.from(chunk.columnData as ArrayLike<ParquetValue>);
      },
    });
  } catch (err) {
    if (err instanceof InputError) throw err;
    const why = String((err as Error).message).replace(/\s+/g, ' ');
    throw new InputError(`${source}: file must be Parquet (SNAPPY, zstd or uncompressed), got unreadable data (${why})`);
  }
  const values = new Map<string, ParquetValue[]>();
  for (const [name, parts] of data) values.set(name, parts.filter((p) => p !== undefined).flat());
  const seen = new Set<string>();
  for (const name of names) {
    if (seen.has(name)) throw new InputError(`${source}: column ${quote(name)} must have a unique name, got it twice`);
    seen.add(name);
  }
  const plain = (value: ParquetValue): string | number | bigint | boolean | null => {
    if (value === null || value === undefined) return null;
    if (value instanceof Date) return value.getTime();
    if (typeof value === 'object') return JSON.stringify(value, (_, v: unknown) => (typeof v === 'bigint' ? String(v) : v));
    return value;
  };
  const columns: InputColumn[] = names.map((name) => {
    const column = values.get(name)!;
    const first = column.find((v) => v !== null && v !== undefined);
    const kind: InputColumn['kind'] = typeof first === 'string' ? 'utf8' : typeof first === 'number' ? 'number' : 'other';
    return { name, kind, get: (row: number) => plain(column[row]) };
  });
  const keys = resolveKeyColumns(names, options, source);
  const stepName = keys.timeCol ?? keys.stepCol;
  const steps = values.get(stepName)!;
  const isTime = steps.some((v) => v instanceof Date);
  if (keys.timeCol === undefined && isTime) {
    throw new InputError(
      `${source}: the step column ${quote(stepName)} must hold step numbers, got a Parquet timestamp column (use --time-col ${stepName}, with --period)`,
    );
  }
  const runs = values.get(keys.runCol)!;
  const readings = values.get(keys.readingCol)!;
  return buildRunsTable(
    {
      source,
      nRows,
      columns,
      ...keys,
      runAt: (row) => runs[row],
      stepAt: (row) => {
        const v = steps[row];
        return v instanceof Date ? v.getTime() / 1000 : v;
      },
      readingAt: (row) => readings[row],
      ...(isTime ? { describeTime: (s: number) => new Date(s * 1000).toISOString() } : {}),
      locate: (row) => `row ${row + 1}`,
    },
    options,
  );
}
