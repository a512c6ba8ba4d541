import { DataType, Precision, tableFromIPC, type Data, type Table, type Vector } from 'apache-arrow';
import { InputError, quote } from '../errors.js';
import { buildRunsTable } from './build-runs-table.js';
import { MAX_TABLE_COLUMNS, parseCsv, type CsvColumn } from './parse-csv.js';
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
      runAt: csvText(run, []),
      stepAt: (row) => {
        const value = step.digits(row);
        return value >= 0 ? value : step.get(row);
      },
      readingAt: csvText(reading, options.surfaces),
      locate: (row) => `line ${csv.lineOfRow(row)}`,
    },
    options,
  );
}

/**
 * Reads a text key column row by row, in row order, without making a string per row: a field equal to
 * the previous row's returns the same string (a run's id is sliced once per run), a field equal to one
 * of `known` (the surfaces) returns that string; only other fields are sliced.
 */
function csvText(column: CsvColumn, known: readonly string[]): (row: number) => string | null {
  let lastRow = -1;
  let last: string | null = null;
  return (row) => {
    if (lastRow < 0 || !column.sameAs(row, lastRow)) {
      last = known.find((value) => column.equals(row, value)) ?? column.get(row);
    }
    lastRow = row;
    return last;
  };
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
    keyValues(vectors[names.indexOf(name)], name === keys.readingCol ? options.surfaces : []),
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
  if (names.length > MAX_TABLE_COLUMNS) {
    throw new InputError(`${source}: table must have at most ${MAX_TABLE_COLUMNS} columns, got ${names.length}`);
  }
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
 * Reads a key column row by row, in row order, without a JavaScript value per row where it can: numbers
 * without nulls come from one typed array; Utf8 text (`utf8Values`) and dictionary-encoded text
 * (`dictionaryValues`) return strings shared between rows. Other types are decoded per call and dropped
 * soon after.
 */
function keyValues(vector: Vector, known: readonly string[]): (row: number) => unknown {
  const type = vector.type as DataType;
  const halfFloat = DataType.isFloat(type) && type.precision === Precision.HALF;
  if (vector.nullCount === 0 && isNumeric(type) && !halfFloat) {
    const values = vector.toArray() as ArrayLike<unknown>;
    return (row) => values[row];
  }
  if (DataType.isUtf8(type)) return chunked(vector, (data) => utf8Values(data, known));
  if (DataType.isDictionary(type) && isText(type.dictionary)) return chunked(vector, dictionaryValues);
  return (row) => toPlain(vector.get(row));
}

/**
 * Reads a vector chunk by chunk (record batch by record batch) with a reader made per chunk; rows are
 * expected in order, and a row before the current chunk starts over from the first chunk.
 */
function chunked(vector: Vector, reader: (data: Data) => (index: number) => unknown): (row: number) => unknown {
  const chunks = vector.data;
  let k = -1;
  let first = 0;
  let length = 0;
  let read: (index: number) => unknown = () => null;
  return (row) => {
    if (row < first) {
      k = -1;
      first = 0;
      length = 0;
    }
    while (row >= first + length && k + 1 < chunks.length) {
      first += length;
      k++;
      length = chunks[k].length;
      read = reader(chunks[k]);
    }
    return read(row - first);
  };
}

/**
 * One Utf8 chunk's values: a value whose bytes equal the previous value's returns the same string (a
 * run's id is decoded once per run), one equal to the UTF-8 bytes of a `known` string returns that
 * string; only other values are decoded (as `Vector.get` decodes them).
 */
function utf8Values(data: Data, known: readonly string[]): (index: number) => string | null {
  const encoder = new TextEncoder();
  const decoder = new TextDecoder();
  const knownBytes = known.map((value) => encoder.encode(value));
  const offsets = data.valueOffsets as Int32Array;
  const bytes = data.values as Uint8Array;
  const same = (x: number, y: number, other: Uint8Array, at: number): boolean => {
    if (other.length - at < y - x) return false;
    for (let p = x; p < y; p++) if (bytes[p] !== other[at + p - x]) return false;
    return true;
  };
  let lastStart = -1;
  let lastEnd = -1;
  let last: string | null = null;
  const validity = data.nullCount > 0 ? data.nullBitmap : null;
  const offset = data.offset;
  return (index) => {
    if (validity !== null && ((validity[(offset + index) >> 3] >> ((offset + index) & 7)) & 1) === 0) return null;
    const x = offsets[index];
    const y = offsets[index + 1];
    if (lastStart < 0 || y - x !== lastEnd - lastStart || !same(x, y, bytes, lastStart)) {
      const k = knownBytes.findIndex((b) => b.length === y - x && same(x, y, b, 0));
      last = k >= 0 ? known[k] : decoder.decode(bytes.subarray(x, y));
    }
    lastStart = x;
    lastEnd = y;
    return last;
  };
}

/** One dictionary-encoded chunk's values: the dictionary is decoded once, each row reads its key. */
function dictionaryValues(data: Data): (index: number) => string | null {
  const dictionary = data.dictionary ? (Array.from(data.dictionary.toArray() as ArrayLike<unknown>, toPlain) as Array<string | null>) : [];
  const keys = data.values as ArrayLike<number | bigint>;
  return (index) => (data.getValid(index) ? (dictionary[Number(keys[index])] ?? null) : null);
}
