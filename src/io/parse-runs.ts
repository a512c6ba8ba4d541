import { DataType, Precision, tableFromIPC, type Table, type Vector } from 'apache-arrow';
import { InputError, quote } from '../errors.js';
import { buildRunsTable } from './build-runs-table.js';
import { parseCsv } from './parse-csv.js';
import { resolveKeyColumns } from './resolve-key-columns.js';
import type { InputColumn, ReadRunsOptions, RunsTable } from './runs-table.js';

/**
 * Reads a runs table from CSV text (CONTRACT.md, "Runs table"). Every column is kept as text
 * (`kind: 'utf8'`); an empty unquoted field is null. Messages locate rows by file line.
 */
export function runsFromCsv(text: string, source: string, options: ReadRunsOptions): RunsTable {
  const csv = parseCsv(text, source);
  const columns: InputColumn[] = csv.header.map((name, j) => {
    const column = csv.columns[j];
    return { name, kind: 'utf8', get: (row: number) => column.get(row) };
  });
  const keys = resolveKeyColumns(csv.header, options, source);
  const [run, step, reading] = [keys.runCol, keys.stepCol, keys.readingCol].map(
    (name) => csv.columns[csv.header.indexOf(name)],
  );
  return buildRunsTable(
    {
      source,
      nRows: csv.nRows,
      columns,
      ...keys,
      runAt: (row) => run.get(row),
      stepAt: (row) => step.get(row),
      readingAt: (row) => reading.get(row),
      locate: (row) => `line ${csv.lineOfRow(row)}`,
    },
    options,
  );
}

/**
 * Reads a runs table from Arrow IPC bytes, file or stream format (`tableFromIPC` tells them apart).
 * Steps may be integers, bigints, floats or text holding whole numbers. Columns keep their Arrow type
 * (`arrowType`) for pass-through. Messages locate rows as `row N`, counting data rows from 1.
 */
export function runsFromArrow(bytes: Uint8Array, source: string, options: ReadRunsOptions): RunsTable {
  const table = decodeArrow(bytes, source);
  const names = table.schema.fields.map((field) => field.name);
  checkNames(names, source);
  const vectors = names.map((_, j) => table.getChildAt(j) as Vector);
  const columns = vectors.map((vector, j) => arrowColumn(names[j], vector));
  const keys = resolveKeyColumns(names, options, source);
  const [runs, steps, readings] = [keys.runCol, keys.stepCol, keys.readingCol].map((name) =>
    keyValues(vectors[names.indexOf(name)]),
  );
  return buildRunsTable(
    {
      source,
      nRows: table.numRows,
      columns,
      ...keys,
      runAt: runs,
      stepAt: steps,
      readingAt: readings,
      locate: (row) => `row ${row + 1}`,
    },
    options,
  );
}

function decodeArrow(bytes: Uint8Array, source: string): Table {
  if (bytes.length === 0) throw new InputError(`${source}: file must be Arrow IPC (file or stream), got an empty file`);
  try {
    return tableFromIPC(bytes);
  } catch (err) {
    const why = String((err as Error).message).replace(/\s+/g, ' ');
    throw new InputError(`${source}: file must be Arrow IPC (file or stream), got unreadable data (${why})`);
  }
}

function checkNames(names: string[], source: string): void {
  const firstAt = new Map<string, number>();
  names.forEach((name, i) => {
    if (name === '') throw new InputError(`${source}: column ${i + 1} must have a name, got an empty name`);
    const first = firstAt.get(name);
    if (first !== undefined) {
      throw new InputError(`${source}: column ${i + 1} must have a unique name, got ${quote(name)} again (also column ${first + 1})`);
    }
    firstAt.set(name, i);
  });
}

function isText(type: DataType): boolean {
  return DataType.isUtf8(type) || DataType.isLargeUtf8(type) || DataType.isUtf8View(type);
}

function isNumeric(type: DataType): boolean {
  return DataType.isInt(type) || DataType.isFloat(type);
}

function kindOf(type: DataType): InputColumn['kind'] {
  if (isNumeric(type)) return 'number';
  if (isText(type) || (DataType.isDictionary(type) && isText(type.dictionary))) return 'utf8';
  return 'other';
}

/** Arrow values as the pass-through accepts them: dates become epoch milliseconds, nested values text. */
function toPlain(value: unknown): string | number | bigint | boolean | null {
  if (value === null || value === undefined) return null;
  switch (typeof value) {
    case 'string':
    case 'number':
    case 'bigint':
    case 'boolean':
      return value;
    default:
      return value instanceof Date ? value.getTime() : String(value);
  }
}

function arrowColumn(name: string, vector: Vector): InputColumn {
  const type = vector.type as DataType;
  const kind = kindOf(type);
  const get =
    kind === 'other'
      ? (row: number) => toPlain(vector.get(row))
      : (row: number) => (vector.get(row) as string | number | bigint | null) ?? null;
  return { name, kind, arrowType: type, get };
}

/**
 * Reads a key column by row. Numbers without nulls come from one typed array; other values are decoded
 * per call and dropped soon after, which costs less than keeping millions of decoded strings.
 */
function keyValues(vector: Vector): (row: number) => unknown {
  const type = vector.type as DataType;
  const halfFloat = DataType.isFloat(type) && type.precision === Precision.HALF;
  if (vector.nullCount === 0 && isNumeric(type) && !halfFloat) {
    const values = vector.toArray() as ArrayLike<unknown>;
    return (row) => values[row];
  }
  return (row) => toPlain(vector.get(row));
}
