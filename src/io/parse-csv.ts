import { Buffer, isAscii } from 'node:buffer';
import { InputError, quote } from '../errors.js';
import { checkUtf8 } from './decode-utf8.js';
import { isWellFormedText } from './json-fields.js';

/**
 * One CSV column: its fields are located in the table's bytes when asked for (see `CsvTable.seek`) and
 * decoded into a string only by `get`. Millions of fields then cost nothing each beyond the bytes.
 */
export class CsvColumn {
  constructor(
    private readonly table: CsvTable,
    private readonly index: number,
    readonly nRows: number,
  ) {}

  /** The field at `row`: `null` for an empty unquoted field, `''` for a quoted empty field (`""`). */
  get(row: number): string | null {
    const t = this.table;
    t.seek(row);
    const start = t.fieldStart[this.index];
    if (start >= 0) return t.slice(start, t.fieldEnd[this.index]);
    return start === NULL_FIELD ? null : (t.fieldValue[this.index] as string);
  }

  /** True when the field at `row` is exactly `value` (text; never true for a null field), without decoding it. */
  equals(row: number, value: string): boolean {
    const t = this.table;
    t.seek(row);
    const start = t.fieldStart[this.index];
    if (start < 0) return start === ESCAPED_FIELD && t.fieldValue[this.index] === value;
    return t.bytesEqual(start, t.fieldEnd[this.index], t.encoded(value));
  }

  /**
   * The field at `row` as a number when it is nothing but 1 to 15 decimal digits (so the number is exact),
   * read without decoding; −1 otherwise (the caller then looks at the text).
   */
  digits(row: number): number {
    const t = this.table;
    t.seek(row);
    const start = t.fieldStart[this.index];
    return start < 0 ? -1 : t.digits(start, t.fieldEnd[this.index]);
  }

  /** Every field, in row order. */
  toArray(): (string | null)[] {
    const values = new Array<string | null>(this.nRows);
    for (let row = 0; row < this.nRows; row++) values[row] = this.get(row);
    return values;
  }
}

/**
 * A CSV file as columns over its bytes: per row only where it starts (4 bytes); a row's fields are
 * located again when a row is visited (`seek`, one row remembered), so reading rows in order costs one
 * more pass over the bytes and no per-field storage.
 */
export class CsvTable {
  /** One per header column. */
  readonly columns: CsvColumn[];
  /** After `seek(row)`: each field's byte range, or `NULL_FIELD` / `ESCAPED_FIELD` (value in `fieldValue`). */
  readonly fieldStart: Int32Array;
  readonly fieldEnd: Int32Array;
  readonly fieldValue: (string | undefined)[];
  private row = -1;
  private rowLines: Int32Array | null = null;
  private readonly encodedValues = new Map<string, Uint8Array>();
  private readonly decode: (start: number, end: number) => string;

  constructor(
    readonly header: string[],
    readonly nRows: number,
    private readonly bytes: Buffer,
    /** Byte offset at which each data row starts. */
    private readonly rowStarts: Int32Array,
    /** Offset of the first byte after the byte-order mark, if any. */
    private readonly firstByte: number,
  ) {
    const n = header.length;
    this.fieldStart = new Int32Array(n);
    this.fieldEnd = new Int32Array(n);
    this.fieldValue = new Array<string | undefined>(n);
    this.columns = header.map((_, j) => new CsvColumn(this, j, nRows));
    // ASCII bytes decode as Latin-1 far faster than through the UTF-8 decoder, with the same result.
    this.decode = isAscii(bytes) ? (s, e) => bytes.toString('latin1', s, e) : (s, e) => bytes.toString('utf8', s, e);
  }

  /** 1-based line of the file on which data row `row` (0-based) starts; quoted line breaks count. */
  lineOfRow(row: number): number {
    // Counted on first use (messages only), for every row at once.
    if (this.rowLines === null) {
      const lines = new Int32Array(this.nRows);
      const b = this.bytes;
      let line = 1;
      let pos = this.firstByte;
      for (let r = 0; r < this.nRows; r++) {
        const to = this.rowStarts[r];
        for (; pos < to; pos++) {
          const c = b[pos];
          if (c === LF || (c === CR && b[pos + 1] !== LF)) line++;
        }
        lines[r] = line;
      }
      this.rowLines = lines;
    }
    return this.rowLines[row];
  }

  /** Locates the fields of `row` in `fieldStart` / `fieldEnd` / `fieldValue` (the row was checked by the parser). */
  seek(row: number): void {
    if (row === this.row) return;
    if (!(row >= 0 && row < this.nRows)) throw new RangeError(`CSV row ${row} is outside 0…${this.nRows - 1}`);
    const b = this.bytes;
    const end = b.length;
    const nCols = this.header.length;
    let pos = this.rowStarts[row];
    for (let j = 0; j < nCols; j++) {
      if (b[pos] === QUOTE) {
        const fieldStart = ++pos;
        let chunkStart = pos;
        let parts: string | undefined;
        for (;;) {
          if (b[pos] === QUOTE) {
            if (b[pos + 1] !== QUOTE) break;
            parts = (parts ?? '') + this.decode(chunkStart, pos + 1);
            pos += 2;
            chunkStart = pos;
            continue;
          }
          pos++;
        }
        if (parts !== undefined) {
          this.fieldStart[j] = ESCAPED_FIELD;
          this.fieldValue[j] = parts + this.decode(chunkStart, pos);
        } else {
          this.fieldStart[j] = fieldStart;
          this.fieldEnd[j] = pos;
        }
        pos++;
      } else {
        const fieldStart = pos;
        while (pos < end) {
          const c = b[pos];
          if (c === COMMA || c === LF || c === CR) break;
          pos++;
        }
        this.fieldStart[j] = pos === fieldStart ? NULL_FIELD : fieldStart;
        this.fieldEnd[j] = pos;
      }
      pos++;
    }
    this.row = row;
  }

  /** The bytes [start, end) as text. */
  slice(start: number, end: number): string {
    return this.decode(start, end);
  }

  /** `value` as UTF-8 bytes (kept: the same few values are compared on every row). */
  encoded(value: string): Uint8Array {
    let bytes = this.encodedValues.get(value);
    if (bytes === undefined) {
      bytes = Buffer.from(value, 'utf8');
      if (this.encodedValues.size < 1024) this.encodedValues.set(value, bytes);
    }
    return bytes;
  }

  /** True when the bytes [start, end) are `other`. */
  bytesEqual(start: number, end: number, other: Uint8Array): boolean {
    const length = other.length;
    if (end - start !== length) return false;
    const b = this.bytes;
    for (let k = 0; k < length; k++) if (b[start + k] !== other[k]) return false;
    return true;
  }

  /** True when the bytes [a, aEnd) equal the bytes [b, b + aEnd − a) of the same file. */
  rangesEqual(a: number, aEnd: number, b: number, bEnd: number): boolean {
    const length = aEnd - a;
    if (bEnd - b !== length) return false;
    const bytes = this.bytes;
    for (let k = 0; k < length; k++) if (bytes[a + k] !== bytes[b + k]) return false;
    return true;
  }

  /** The bytes [start, end) as a number when they are 1 to 15 decimal digits; −1 otherwise. */
  digits(start: number, end: number): number {
    if (end - start > 15) return -1;
    const b = this.bytes;
    let value = 0;
    for (let k = start; k < end; k++) {
      const d = b[k] - 48;
      if (d < 0 || d > 9) return -1;
      value = value * 10 + d;
    }
    return value;
  }
}

/**
 * A header may name at most this many columns: every column costs storage sized to the rows, so a
 * header line of a few megabytes could otherwise ask for gigabytes before any row is read.
 */
export const MAX_TABLE_COLUMNS = 10_000;

const COMMA = 44;
const QUOTE = 34;
const LF = 10;
const CR = 13;
const NULL_FIELD = -1;
const ESCAPED_FIELD = -2;

/**
 * Parses comma-separated values as RFC 4180 describes them (section 2): a header row, fields optionally
 * in double quotes, `""` for a quote inside quotes, quoted fields may hold commas and line breaks. Also
 * accepted: a leading byte-order mark, LF, CRLF or CR line ends, a last line with or without a line end;
 * empty lines at the end are ignored. Nothing is trimmed; a quote inside an unquoted field is kept as
 * text. `input` is the file's bytes (which must be strict UTF-8: checked here) or its text (which must
 * be well-formed Unicode: no lone surrogates). Errors name `source` and the line: bytes that are not
 * UTF-8, an empty file, empty or repeated header names, a header of more than `MAX_TABLE_COLUMNS`
 * columns (found while the header is read), a row with the wrong number of fields, an unclosed quote,
 * text after a closing quote. Memory: the bytes and 4 bytes per row, sized from the bytes (a row of
 * n fields needs at least n bytes); no storage per field.
 */
export function parseCsv(input: string | Uint8Array, source: string): CsvTable {
  let b: Buffer;
  if (typeof input === 'string') {
    if (!isWellFormedText(input)) {
      throw new InputError(`${source}: text must be well-formed Unicode, got a lone surrogate on line ${lineOfSurrogate(input)}`);
    }
    b = Buffer.from(input, 'utf8');
  } else {
    checkUtf8(input, source);
    b = Buffer.isBuffer(input) ? input : Buffer.from(input.buffer, input.byteOffset, input.byteLength);
  }
  const firstByte = b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? 3 : 0;
  let pos = firstByte;
  const end = b.length;
  const decode = (s: number, e: number): string => b.toString('utf8', s, e);
  let line = 1;
  const header: string[] = [];
  let nCols = 0;
  let nRows = 0;
  // Room for as many rows as the bytes have line ends (grown if a CR-only file holds more), allocated
  // once: growing by doubling touches about twice the memory, and fresh memory is slow to touch.
  let capacity = countLineEnds(b) + 1;
  let maxRows = capacity;
  let rowStarts: Int32Array = new Int32Array(0);
  let inHeader = true;

  while (pos < end) {
    if (onlyLineEndsFrom(b, pos)) break;
    const recordLine = line;
    if (!inHeader) {
      if (nRows === capacity) {
        capacity = Math.max(nRows + 1, Math.min(maxRows, Math.max(1024, capacity * 2)));
        rowStarts = grow(rowStarts, capacity);
      }
      rowStarts[nRows] = pos;
    }
    let nFields = 0;
    let firstEmpty = false;
    for (;;) {
      const c0 = pos < end ? b[pos] : -1;
      if (c0 === QUOTE) {
        const openLine = line;
        const fieldStart = ++pos;
        let chunkStart = pos;
        let parts: string | undefined;
        for (;;) {
          if (pos >= end) {
            throw new InputError(
              `${source}: line ${openLine} field ${nFields + 1} must close its opening quote, got the end of the file`,
            );
          }
          const c = b[pos];
          if (c === QUOTE) {
            if (b[pos + 1] === QUOTE) {
              if (inHeader) parts = (parts ?? '') + decode(chunkStart, pos + 1);
              pos += 2;
              chunkStart = pos;
              continue;
            }
            break;
          }
          if (c === LF || (c === CR && b[pos + 1] !== LF)) line++;
          pos++;
        }
        if (inHeader) pushHeader(header, parts !== undefined ? parts + decode(chunkStart, pos) : decode(fieldStart, pos), source, line);
        pos++;
        if (pos < end) {
          const c = b[pos];
          if (c !== COMMA && c !== LF && c !== CR) {
            throw new InputError(
              `${source}: line ${line} field ${nFields + 1} must end at its closing quote, got ${quote(decode(pos, Math.min(end, pos + 40)).slice(0, 10))} after it`,
            );
          }
        }
      } else {
        const fieldStart = pos;
        while (pos < end) {
          const c = b[pos];
          if (c === COMMA || c === LF || c === CR) break;
          pos++;
        }
        if (nFields === 0) firstEmpty = pos === fieldStart;
        if (inHeader) pushHeader(header, decode(fieldStart, pos), source, line);
      }
      nFields++;

      if (pos >= end) break;
      const c = b[pos++];
      if (c === COMMA) continue;
      if (c === CR && b[pos] === LF) pos++;
      line++;
      break;
    }

    if (inHeader) {
      checkHeader(header, source);
      nCols = header.length;
      // A row of n fields takes at least n bytes (n − 1 commas and a line end), so the rest of the
      // bytes hold at most (rest / n) + 1 rows: with many columns that is far fewer than their line ends.
      maxRows = Math.floor((end - pos) / nCols) + 1;
      capacity = Math.min(capacity, maxRows);
      rowStarts = new Int32Array(capacity);
      inHeader = false;
      continue;
    }
    if (nFields !== nCols) {
      const hint = nFields === 1 && firstEmpty ? ' (an empty line)' : '';
      throw new InputError(`${source}: line ${recordLine} must have ${nCols} fields like the header, got ${nFields}${hint}`);
    }
    nRows++;
  }

  if (inHeader) throw new InputError(`${source}: file must have a header row, got an empty file`);
  return new CsvTable(header, nRows, b, rowStarts, firstByte);
}

function pushHeader(header: string[], name: string, source: string, line: number): void {
  if (header.length === MAX_TABLE_COLUMNS) {
    throw new InputError(
      `${source}: header must name at most ${MAX_TABLE_COLUMNS} columns, got more (field ${MAX_TABLE_COLUMNS + 1} on line ${line})`,
    );
  }
  header.push(name);
}

function grow(array: Int32Array, capacity: number): Int32Array {
  const grown = new Int32Array(capacity);
  grown.set(array);
  return grown;
}

function checkHeader(header: string[], source: string): void {
  const firstAt = new Map<string, number>();
  header.forEach((name, i) => {
    if (name === '') throw new InputError(`${source}: header column ${i + 1} must have a name, got an empty field`);
    const first = firstAt.get(name);
    if (first !== undefined) {
      throw new InputError(`${source}: header column ${i + 1} must have a unique name, got ${quote(name)} again (also column ${first + 1})`);
    }
    firstAt.set(name, i);
  });
}

/** Line feeds in the bytes, or carriage returns when there is no line feed (a CR-only file). */
function countLineEnds(b: Buffer): number {
  let n = 0;
  for (let at = b.indexOf(LF); at >= 0; at = b.indexOf(LF, at + 1)) n++;
  if (n === 0) for (let at = b.indexOf(CR); at >= 0; at = b.indexOf(CR, at + 1)) n++;
  return n;
}

/** True when the bytes from `pos` on are nothing but line ends (checked only where a line is empty). */
function onlyLineEndsFrom(b: Buffer, pos: number): boolean {
  for (let c = b[pos]; c === LF || c === CR; c = b[++pos]);
  return pos >= b.length;
}

/** The 1-based line (LF, CRLF or CR line ends) of the first lone surrogate in `text`. */
function lineOfSurrogate(text: string): number {
  const at = text.search(/\p{Cs}/u);
  const before = text.slice(0, Math.max(0, at));
  return 1 + (before.match(/\r\n|\r|\n/g)?.length ?? 0);
}
