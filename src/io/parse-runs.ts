import { DataType, Precision, tableFromIPC, type Data, type Table, type Vector } from 'apache-arrow';
import { InputError, quote } from '../errors.js';
import { buildRunsTable } from './build-runs-table.js';
import { registerArrowCodecs } from './arrow-codecs.js';
import { MAX_TABLE_COLUMNS } from './parse-csv.js';
import { resolveKeyColumns } from './resolve-key-columns.js';
import type { InputColumn, ReadRunsOptions, RunsTable } from './runs-table.js';

// The CSV reader lives in its own file so that reading CSV does not load Apache Arrow (start-up time);
// it is re-exported here for the library index and existing callers.
export { runsFromCsv } from './runs-from-csv.js';

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
  const stepName = keys.timeCol ?? keys.stepCol;
  const stepVector = vectors[names.indexOf(stepName)];
  const stepType = stepVector.type as DataType;
  const isTimeType = DataType.isTimestamp(stepType) || DataType.isDate(stepType);
  if (keys.timeCol === undefined && isTimeType) {
    throw new InputError(
      `${source}: the step column ${quote(stepName)} must hold step numbers, got an Arrow ${DataType.isDate(stepType) ? 'date' : 'timestamp'} column (use --time-col ${stepName}, with --period)`,
    );
  }
  const [runs, steps, readings] = [keys.runCol, stepName, keys.readingCol].map((name) =>
    name === stepName && isTimeType
      ? timeValues(stepVector)
      : keyValues(vectors[names.indexOf(name)], name === keys.readingCol ? options.surfaces : [], (row) => {
          throw new InputError(`${source}: column ${quote(name)} at row ${row + 1} must be UTF-8 text, got bytes that are not valid UTF-8`);
        }),
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
      ...(keys.timeCol !== undefined ? { timeCol: keys.timeCol } : {}),
      ...(isTimeType ? { describeTime: isoText } : {}),
      locate: (row) => `row ${row + 1}`,
    },
    options,
  );
}

/**
 * An Arrow timestamp or date column as seconds since the epoch (null for a null): timestamps from their
 * stored integers and unit (exact below the millisecond), dates through their millisecond value.
 */
function timeValues(vector: Vector): (row: number) => unknown {
  const type = vector.type as DataType;
  if (!DataType.isTimestamp(type)) {
    return (row) => {
      const value = vector.get(row) as unknown;
      if (value === null || value === undefined) return null;
      return (value instanceof Date ? value.getTime() : Number(value)) / 1000;
    };
  }
  const perSecond = [1n, 1000n, 1_000_000n, 1_000_000_000n][type.unit];
  return chunked(vector, (data, first) => {
    const values = data.values as unknown;
    if (!(values instanceof BigInt64Array)) return (index) => (data.getValid(index) ? Number(vector.get(first + index)) / 1000 : null);
    return (index) => {
      if (!data.getValid(index)) return null;
      const raw = values[index];
      return Number(raw / perSecond) + Number(raw % perSecond) / Number(perSecond);
    };
  });
}

/** Seconds since the epoch as ISO 8601 UTC text, to the microsecond when needed. */
function isoText(seconds: number): string {
  const ms = Math.floor(seconds * 1000);
  const micros = Math.round((seconds * 1000 - ms) * 1000);
  const text = new Date(ms).toISOString();
  return micros > 0 && micros < 1000 ? text.replace('Z', `${String(micros).padStart(3, '0')}Z`) : text;
}

function decodeArrow(bytes: Uint8Array, source: string): Table {
  if (bytes.length === 0) throw new InputError(`${source}: file must be Arrow IPC (file or stream), got an empty file`);
  let table: Table;
  registerArrowCodecs();
  try {
    table = tableFromIPC(bytes);
  } catch (err) {
    const why = String((err as Error).message).replace(/\s+/g, ' ');
    throw new InputError(`${source}: file must be Arrow IPC (file or stream), got unreadable data (${why})`);
  }
  // A stream cut at a record-batch boundary reads as a complete table with fewer rows: the
  // end-of-stream marker (continuation 0xFFFFFFFF then length 0) is required. The pre-0.15 marker (a
  // bare 4-byte zero length) is not accepted: it cannot be told from a batch body's zero padding.
  if (!startsWithFileMagic(bytes) && !endsWithEndOfStream(bytes)) {
    throw new InputError(
      `${source}: Arrow stream must end with its end-of-stream marker, got a stream cut short after ${table.batches.length} record batch(es), ${table.numRows} rows (a truncated or still-growing file)`,
    );
  }
  return table;
}

/** Arrow IPC files start with "ARROW1" (streams start with a message). */
function startsWithFileMagic(bytes: Uint8Array): boolean {
  return bytes.length >= 6 && String.fromCharCode(...bytes.subarray(0, 6)) === 'ARROW1';
}

function endsWithEndOfStream(bytes: Uint8Array): boolean {
  const n = bytes.length;
  if (n < 8) return false;
  const marker = [0xff, 0xff, 0xff, 0xff, 0, 0, 0, 0];
  return marker.every((b, k) => bytes[n - 8 + k] === b);
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
function keyValues(vector: Vector, known: readonly string[], invalid: (row: number) => never): (row: number) => unknown {
  const type = vector.type as DataType;
  const halfFloat = DataType.isFloat(type) && type.precision === Precision.HALF;
  if (vector.nullCount === 0 && isNumeric(type) && !halfFloat) {
    const values = vector.toArray() as ArrayLike<unknown>;
    return (row) => values[row];
  }
  if (DataType.isUtf8(type)) return chunked(vector, (data, first) => utf8Values(data, known, (index) => invalid(first + index)));
  if (DataType.isDictionary(type) && isText(type.dictionary)) return chunked(vector, (data, first) => dictionaryValues(data, (index) => invalid(first + index)));
  return (row) => toPlain(vector.get(row));
}

/**
 * Reads a vector chunk by chunk (record batch by record batch) with a reader made per chunk; rows are
 * expected in order, and a row before the current chunk starts over from the first chunk.
 */
function chunked(vector: Vector, reader: (data: Data, first: number) => (index: number) => unknown): (row: number) => unknown {
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
      read = reader(chunks[k], first);
    }
    return read(row - first);
  };
}

/**
 * One Utf8 chunk's values: a value whose bytes equal the previous value's returns the same string (a
 * run's id is decoded once per run), one equal to the UTF-8 bytes of a `known` string returns that
 * string; only other values are decoded (as `Vector.get` decodes them).
 */
function utf8Values(data: Data, known: readonly string[], invalid: (index: number) => never): (index: number) => string | null {
  const encoder = new TextEncoder();
  // Strict: a bad byte in a run id or reading is an error naming the row, never a silent U+FFFD.
  const decoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
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
      if (k >= 0) last = known[k];
      else {
        try {
          last = decoder.decode(bytes.subarray(x, y));
        } catch {
          invalid(index);
        }
      }
    }
    lastStart = x;
    lastEnd = y;
    return last;
  };
}

/** One dictionary-encoded chunk's values: the dictionary is decoded once, each row reads its key. */
function dictionaryValues(data: Data, invalid: (index: number) => never): (index: number) => string | null {
  const dictionary = data.dictionary ? (Array.from(data.dictionary.toArray() as ArrayLike<unknown>, toPlain) as Array<string | null>) : [];
  // The dictionary's text is checked as strict UTF-8 once; a row using a damaged entry is named.
  const damaged = new Set<number>();
  if (data.dictionary) {
    const strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
    let base = 0;
    for (const chunk of data.dictionary.data) {
      const offsets = chunk.valueOffsets as Int32Array | undefined;
      const bytes = chunk.values as Uint8Array | undefined;
      if (offsets && bytes instanceof Uint8Array) {
        for (let i = 0; i < chunk.length; i++) {
          try {
            strict.decode(bytes.subarray(offsets[i], offsets[i + 1]));
          } catch {
            damaged.add(base + i);
          }
        }
      }
      base += chunk.length;
    }
  }
  const keys = data.values as ArrayLike<number | bigint>;
  return (index) => {
    if (!data.getValid(index)) return null;
    const key = Number(keys[index]);
    if (damaged.size && damaged.has(key)) invalid(index);
    return dictionary[key] ?? null;
  };
}
