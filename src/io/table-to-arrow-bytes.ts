import {
  Bool,
  type CompressionType,
  type Data,
  DataType,
  Dictionary,
  Field,
  Float64,
  Int32,
  Int64,
  makeBuilder,
  makeData,
  makeVector,
  Precision,
  RecordBatch,
  Schema,
  Struct,
  Table,
  tableToIPC,
  Utf8,
} from 'apache-arrow';
import { WorkError, quote } from '../errors.js';
import { checkOutputTable } from './check-output-table.js';
import { compressedTableToIPC } from './compressed-ipc-writer.js';
import type { OutputColumn, OutputTable } from './output-table.js';

type Value = string | number | bigint | boolean | null;

/**
 * Encodes a table as Arrow IPC bytes, the file format or (`stream`) the stream format. Column types:
 * `utf8` → Utf8, `float64` → Float64, `int32` → Int32, `int64` → Int64, `dictionary` → Dictionary with
 * Utf8 values and Int32 indices (the column's fixed dictionary, else its distinct values in order of first
 * appearance), all nullable. `passthrough` keeps the column's
 * `arrowType` when it is an integer, float or boolean type; text types (LargeUtf8, dictionary) become Utf8;
 * otherwise the type follows the values: all numbers → Float64, all bigints → Int64, all booleans →
 * Bool, anything else (text, mixed) → Utf8 of the values' text.
 */
export function tableToArrowBytes(
  table: OutputTable,
  stream: boolean,
  where = 'output table',
  /** Body compression (its encoder registered first: `registerArrowEncoder`); null = none. */
  compression: CompressionType | null = null,
): Uint8Array {
  checkOutputTable(table, where);
  const fields: Field[] = [];
  const children: Data[] = [];
  for (const column of table.columns) {
    const data = columnData(column, table.nRows, where);
    fields.push(new Field(column.name, data.type, true));
    children.push(data);
  }
  const schema = new Schema(fields, new Map(Object.entries(table.metadata ?? {})));
  const batch = new RecordBatch(
    schema,
    makeData({ type: new Struct(fields), length: table.nRows, nullCount: 0, children }),
  );
  const out = new Table(schema, [batch]);
  return compression === null ? tableToIPC(out, stream ? 'stream' : 'file') : compressedTableToIPC(out, stream, compression);
}

function columnData(column: OutputColumn, nRows: number, where: string): Data {
  switch (column.kind) {
    case 'utf8':
      return utf8Data(column, nRows, where);
    case 'float64':
      return float64Data(column, nRows, where);
    case 'int32':
      return int32Data(column, nRows, where);
    case 'int64':
      return int64Data(column, nRows, where);
    case 'dictionary':
      return dictionaryData(column, nRows, where);
    case 'passthrough':
      return passthroughData(column, nRows, where);
  }
}

/** Validity bitmap (bit set = value present) over `nRows`, filled by the callers below. */
function newValidity(nRows: number): Uint8Array {
  return new Uint8Array((nRows + 7) >> 3);
}

/**
 * Utf8 data written directly (offsets, bytes, validity): the generic Arrow builder costs microseconds per
 * value. ASCII is copied char by char; other text goes through TextEncoder.
 */
function utf8Data(column: OutputColumn, nRows: number, where: string): Data {
  const offsets = new Int32Array(nRows + 1);
  const validity = newValidity(nRows);
  let bytes = new Uint8Array(Math.max(1024, nRows * 8));
  let length = 0;
  let nullCount = 0;
  const encoder = new TextEncoder();
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null || v === undefined) {
      nullCount++;
      offsets[row + 1] = length;
      continue;
    }
    validity[row >> 3] |= 1 << (row & 7);
    const text = typeof v === 'string' ? v : String(v);
    const worst = length + text.length * 3;
    if (worst > bytes.length) {
      if (worst > 0x7fffffff) {
        throw new WorkError(`${where}: column ${quote(column.name)} must hold under 2 GB of text for Arrow, got more by row ${row + 1}`);
      }
      const grown = new Uint8Array(Math.min(0x7fffffff, Math.max(worst, bytes.length * 2)));
      grown.set(bytes.subarray(0, length));
      bytes = grown;
    }
    let k = 0;
    for (; k < text.length; k++) {
      const c = text.charCodeAt(k);
      if (c >= 0x80) break;
      bytes[length + k] = c;
    }
    length += k === text.length ? k : encoder.encodeInto(text, bytes.subarray(length)).written;
    offsets[row + 1] = length;
  }
  return makeData({
    type: new Utf8(),
    length: nRows,
    nullCount,
    nullBitmap: nullCount > 0 ? validity : null,
    valueOffsets: offsets,
    data: bytes.slice(0, length),
  }) as Data;
}

function float64Data(column: OutputColumn, nRows: number, where: string): Data {
  const values = new Float64Array(nRows);
  const validity = newValidity(nRows);
  let nullCount = 0;
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null || v === undefined) {
      nullCount++;
      continue;
    }
    if (typeof v === 'number') values[row] = v;
    else if (typeof v === 'bigint') values[row] = Number(v);
    else throw badValue(column, 'a number', v, row, where);
    validity[row >> 3] |= 1 << (row & 7);
  }
  return makeData({ type: new Float64(), length: nRows, nullCount, nullBitmap: nullCount > 0 ? validity : null, data: values }) as Data;
}

function int32Data(column: OutputColumn, nRows: number, where: string): Data {
  const values = new Int32Array(nRows);
  const validity = newValidity(nRows);
  let nullCount = 0;
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null || v === undefined) {
      nullCount++;
      continue;
    }
    if (!(typeof v === 'number' && Number.isInteger(v) && v >= -0x80000000 && v <= 0x7fffffff)) {
      throw badValue(column, 'a 32-bit integer', v, row, where);
    }
    values[row] = v;
    validity[row >> 3] |= 1 << (row & 7);
  }
  return makeData({ type: new Int32(), length: nRows, nullCount, nullBitmap: nullCount > 0 ? validity : null, data: values }) as Data;
}

/**
 * Int64 data written as two 32-bit halves (little-endian, as Arrow stores it) so no bigint is made per
 * row; values are whole numbers within ±2^53, or bigints.
 */
function int64Data(column: OutputColumn, nRows: number, where: string): Data {
  const values = new BigInt64Array(nRows);
  const halves = new Int32Array(values.buffer);
  const validity = newValidity(nRows);
  let nullCount = 0;
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null || v === undefined) {
      nullCount++;
      continue;
    }
    if (typeof v === 'bigint') {
      values[row] = v;
    } else if (typeof v === 'number' && Number.isSafeInteger(v)) {
      const high = Math.floor(v / 4294967296);
      halves[2 * row] = v - high * 4294967296; // low 32 bits, taken modulo 2^32 by the Int32Array
      halves[2 * row + 1] = high;
    } else {
      throw badValue(column, 'a whole number within ±2^53', v, row, where);
    }
    validity[row >> 3] |= 1 << (row & 7);
  }
  return makeData({ type: new Int64(), length: nRows, nullCount, nullBitmap: nullCount > 0 ? validity : null, data: values }) as Data;
}

/**
 * Dictionary-encoded text: Int32 indices into a Utf8 dictionary. With the column's fixed `dictionary` and
 * `code` the indices are taken as given; otherwise the dictionary is the distinct values in order of first
 * appearance.
 */
function dictionaryData(column: OutputColumn, nRows: number, where: string): Data {
  const codes = new Int32Array(nRows);
  const validity = newValidity(nRows);
  let nullCount = 0;
  let values: readonly string[];
  if (column.dictionary !== undefined && column.code !== undefined) {
    values = column.dictionary;
    for (let row = 0; row < nRows; row++) {
      const c = column.code(row);
      if (c < 0) {
        nullCount++;
        continue;
      }
      if (!(Number.isInteger(c) && c < values.length)) throw badValue(column, `a dictionary index below ${values.length}`, c, row, where);
      codes[row] = c;
      validity[row >> 3] |= 1 << (row & 7);
    }
  } else {
    const index = new Map<string, number>();
    const list: string[] = [];
    for (let row = 0; row < nRows; row++) {
      const v = column.get(row);
      if (v === null || v === undefined) {
        nullCount++;
        continue;
      }
      const text = typeof v === 'string' ? v : String(v);
      let c = index.get(text);
      if (c === undefined) {
        c = list.length;
        list.push(text);
        index.set(text, c);
      }
      codes[row] = c;
      validity[row >> 3] |= 1 << (row & 7);
    }
    values = list;
  }
  const dictionary = makeVector(utf8Data({ name: column.name, kind: 'utf8', get: (i) => values[i] }, values.length, where) as Data<Utf8>);
  return makeData<Dictionary<Utf8, Int32>>({
    type: new Dictionary(new Utf8(), new Int32()),
    length: nRows,
    nullCount,
    nullBitmap: nullCount > 0 ? validity : null,
    data: codes,
    dictionary,
  }) as Data;
}

function badValue(column: OutputColumn, expected: string, value: Value, row: number, where: string): WorkError {
  return new WorkError(`${where}: column ${quote(column.name)} row ${row + 1} must be ${expected}, got ${quote(value)}`);
}

/** Fills a builder of `type` with the column's values, converted by `convert`; one chunk (for the rarer types). */
function build(type: DataType, column: OutputColumn, nRows: number, convert: (v: Value) => unknown): Data {
  const builder = makeBuilder({ type, nullValues: [null, undefined] });
  for (let row = 0; row < nRows; row++) builder.append(convert(column.get(row)));
  return builder.finish().flush() as Data;
}

/** Arrow types other than text that a pass-through column keeps (values come back as numbers, bigints, booleans). */
function keepsType(type: DataType): boolean {
  return DataType.isInt(type) || DataType.isFloat(type) || DataType.isBool(type);
}

function passthroughData(column: OutputColumn, nRows: number, where: string): Data {
  const hint = column.arrowType;
  if (hint !== undefined && (DataType.isUtf8(hint) || DataType.isLargeUtf8(hint))) return utf8Data(column, nRows, where);
  if (hint !== undefined && DataType.isFloat(hint) && hint.precision === Precision.DOUBLE) {
    return float64Data(column, nRows, where);
  }
  if (hint !== undefined && DataType.isInt(hint) && hint.bitWidth === 32 && hint.isSigned) return int32Data(column, nRows, where);
  if (hint !== undefined && keepsType(hint)) {
    const wantsBigint = DataType.isInt(hint) && hint.bitWidth === 64;
    return build(hint, column, nRows, (v) => {
      if (v === null) return null;
      if (wantsBigint) return typeof v === 'bigint' ? v : BigInt(v as number);
      return typeof v === 'bigint' ? Number(v) : v;
    });
  }
  let numbers = 0;
  let bigints = 0;
  let booleans = 0;
  let present = 0;
  for (let row = 0; row < nRows; row++) {
    const v = column.get(row);
    if (v === null || v === undefined) continue;
    present++;
    if (typeof v === 'number') numbers++;
    else if (typeof v === 'bigint') bigints++;
    else if (typeof v === 'boolean') booleans++;
  }
  if (present > 0 && numbers === present) return float64Data(column, nRows, where);
  if (present > 0 && bigints === present) return build(new Int64(), column, nRows, (v) => v);
  if (present > 0 && booleans === present) return build(new Bool(), column, nRows, (v) => v);
  return utf8Data(column, nRows, where);
}
