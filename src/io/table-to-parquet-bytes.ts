import { DataType } from 'apache-arrow';
import { parquetWriteBuffer } from 'hyparquet-writer';
import { checkOutputTable } from './check-output-table.js';
import type { OutputColumn, OutputTable } from './output-table.js';
import type { ZstdCompress } from './zstd-compressor.js';

type BasicType = 'STRING' | 'INT32' | 'INT64' | 'DOUBLE' | 'BOOLEAN';
type Value = string | number | bigint | boolean | null;

/**
 * Encodes a table as Parquet bytes (hyparquet-writer, SNAPPY pages, one row group per 2^20 rows). Column
 * types follow `tableToArrowBytes`: `utf8` → STRING, `dictionary` → STRING in RLE_DICTIONARY pages,
 * `float64` → DOUBLE, `int32` → INT32, `int64` → INT64; `passthrough`
 * keeps an Arrow integer (INT32 up to 32 bits, else INT64), float (DOUBLE) or boolean type, else follows
 * the values (all numbers → DOUBLE, bigints → INT64, booleans → BOOLEAN, anything else → STRING of the
 * values' text). All columns are optional (nulls allowed). `metadata` becomes the file's key-value metadata.
 */
export function tableToParquetBytes(
  table: OutputTable,
  where = 'output table',
  metadata: Record<string, string> = {},
  /** A zstd compressor: pages compressed with ZSTD instead of SNAPPY (`loadZstdCompressor`). */
  zstd?: ZstdCompress,
): Uint8Array {
  checkOutputTable(table, where);
  const columnData = table.columns.map((column) => {
    const type = typeOf(column, table.nRows);
    const data: Value[] = new Array(table.nRows);
    for (let row = 0; row < table.nRows; row++) {
      const v = column.get(row);
      data[row] = v === null ? null : convert(v, type);
    }
    // Dictionary columns are always written with RLE_DICTIONARY pages (hyparquet-writer otherwise decides by size).
    return { name: column.name, data, type, nullable: true, ...(column.kind === 'dictionary' ? { encoding: 'RLE_DICTIONARY' as const } : {}) };
  });
  const buffer = parquetWriteBuffer({
    columnData,
    rowGroupSize: 1 << 20,
    ...(zstd ? { codec: 'ZSTD' as const, compressors: { ZSTD: zstd } } : {}),
    kvMetadata: Object.entries(metadata).map(([key, value]) => ({ key, value })),
  });
  return new Uint8Array(buffer);
}

function typeOf(column: OutputColumn, nRows: number): BasicType {
  if (column.kind === 'utf8' || column.kind === 'dictionary') return 'STRING';
  if (column.kind === 'int64') return 'INT64';
  if (column.kind === 'float64') return 'DOUBLE';
  if (column.kind === 'int32') return 'INT32';
  const t = column.arrowType;
  if (t) {
    if (DataType.isInt(t)) return t.bitWidth <= 32 ? 'INT32' : 'INT64';
    if (DataType.isFloat(t)) return 'DOUBLE';
    if (DataType.isBool(t)) return 'BOOLEAN';
    if (DataType.isUtf8(t) || DataType.isLargeUtf8(t) || DataType.isDictionary(t)) return 'STRING';
  }
  let seen: BasicType | null = null;
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null) continue;
    const here: BasicType = typeof v === 'number' ? 'DOUBLE' : typeof v === 'bigint' ? 'INT64' : typeof v === 'boolean' ? 'BOOLEAN' : 'STRING';
    if (seen !== null && seen !== here) return 'STRING';
    seen = here;
  }
  return seen ?? 'STRING';
}

function convert(v: string | number | bigint | boolean, type: BasicType): Value {
  switch (type) {
    case 'STRING':
      return String(v);
    case 'INT64':
      return typeof v === 'bigint' ? v : BigInt(Math.trunc(Number(v)));
    case 'INT32':
    case 'DOUBLE':
      return Number(v);
    case 'BOOLEAN':
      return Boolean(v);
  }
}
