import { InputError, quote } from '../errors.js';

/**
 * One CSV column: where each row's field lies in the text (typed arrays), sliced into a string only when
 * asked for. Millions of fields then cost 8 bytes each instead of a long-lived string each.
 */
export class CsvColumn {
  constructor(
    private readonly text: string,
    /** Field start per row; `NULL_FIELD` for an empty unquoted field, `ESCAPED_FIELD` for one in `escaped`. */
    private readonly starts: Int32Array,
    private readonly ends: Int32Array,
    /** Quoted fields that held doubled quotes, already undoubled, by row. */
    private readonly escaped: Map<number, string>,
    readonly nRows: number,
  ) {}

  /** The field at `row`: `null` for an empty unquoted field, `''` for a quoted empty field (`""`). */
  get(row: number): string | null {
    const start = this.starts[row];
    if (start >= 0) return this.text.slice(start, this.ends[row]);
    return start === NULL_FIELD ? null : (this.escaped.get(row) as string);
  }

  /** True when the fields at rows `a` and `b` hold the same value (both null, or the same text), without slicing. */
  sameAs(a: number, b: number): boolean {
    const sa = this.starts[a];
    const sb = this.starts[b];
    if (sa < 0 || sb < 0) return sa === sb && (sa === NULL_FIELD || this.escaped.get(a) === this.escaped.get(b));
    const length = this.ends[a] - sa;
    if (this.ends[b] - sb !== length) return false;
    const text = this.text;
    for (let k = 0; k < length; k++) if (text.charCodeAt(sa + k) !== text.charCodeAt(sb + k)) return false;
    return true;
  }

  /** True when the field at `row` is exactly `value` (text; never true for a null field), without slicing. */
  equals(row: number, value: string): boolean {
    const start = this.starts[row];
    if (start < 0) return start === ESCAPED_FIELD && this.escaped.get(row) === value;
    if (this.ends[row] - start !== value.length) return false;
    const text = this.text;
    for (let k = 0; k < value.length; k++) if (text.charCodeAt(start + k) !== value.charCodeAt(k)) return false;
    return true;
  }

  /**
   * The field at `row` as a number when it is nothing but 1 to 15 decimal digits (so the number is exact),
   * read without slicing; −1 otherwise (the caller then looks at the text).
   */
  digits(row: number): number {
    const start = this.starts[row];
    if (start < 0) return -1;
    const end = this.ends[row];
    if (end - start > 15) return -1;
    const text = this.text;
    let value = 0;
    for (let k = start; k < end; k++) {
      const d = text.charCodeAt(k) - 48;
      if (d < 0 || d > 9) return -1;
      value = value * 10 + d;
    }
    return value;
  }

  /** Every field, in row order. */
  toArray(): (string | null)[] {
    const values = new Array<string | null>(this.nRows);
    for (let row = 0; row < this.nRows; row++) values[row] = this.get(row);
    return values;
  }
}

/** A CSV text as columns: no per-row objects. */
export interface CsvTable {
  header: string[];
  /** One per header column. */
  columns: CsvColumn[];
  nRows: number;
  /** 1-based line of the file on which data row `row` (0-based) starts; quoted line breaks count. */
  lineOfRow(row: number): number;
}

/**
 * A header may name at most this many columns: every column costs typed arrays sized to the rows, so
 * a header line of a few megabytes could otherwise ask for gigabytes before any row is read.
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
 * text. Errors name `source` and the line: an empty file, empty or repeated header names, a header of
 * more than `MAX_TABLE_COLUMNS` columns (found while the header is read), a row with the wrong number of
 * fields, an unclosed quote, text after a closing quote. Memory: 8 bytes per field and 4 per row,
 * sized from the text (a row of n fields needs at least n characters), plus the text itself.
 */
export function parseCsv(text: string, source: string): CsvTable {
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const end = text.length;
  let line = 1;
  const header: string[] = [];
  let nCols = 0;
  let nRows = 0;
  // Room for as many rows as the text has line ends (grown if a CR-only file holds more), allocated once:
  // growing by doubling touches about twice the memory, and fresh memory is slow to touch.
  let capacity = countLineEnds(text) + 1;
  let maxRows = capacity;
  let starts: Int32Array[] = [];
  let ends: Int32Array[] = [];
  let escaped: Map<number, string>[] = [];
  let rowLines: Int32Array = new Int32Array(0);
  let inHeader = true;

  while (pos < end) {
    if (onlyLineEndsFrom(text, pos)) break;
    const recordLine = line;
    if (!inHeader && nRows === capacity) {
      capacity = Math.max(nRows + 1, Math.min(maxRows, Math.max(1024, capacity * 2)));
      starts = starts.map((a) => grow(a, capacity));
      ends = ends.map((a) => grow(a, capacity));
      rowLines = grow(rowLines, capacity);
    }
    let nFields = 0;
    for (;;) {
      // Each field ends with [fieldStart, fieldEnd) set, or with an undoubled `value`.
      let fieldStart: number;
      let fieldEnd: number;
      let value: string | undefined;
      if (pos < end && text.charCodeAt(pos) === QUOTE) {
        const openLine = line;
        fieldStart = ++pos;
        let chunkStart = pos;
        let parts: string | undefined;
        for (;;) {
          if (pos >= end) {
            throw new InputError(
              `${source}: line ${openLine} field ${nFields + 1} must close its opening quote, got the end of the file`,
            );
          }
          const c = text.charCodeAt(pos);
          if (c === QUOTE) {
            if (text.charCodeAt(pos + 1) === QUOTE) {
              parts = (parts ?? '') + text.slice(chunkStart, pos + 1);
              pos += 2;
              chunkStart = pos;
              continue;
            }
            break;
          }
          if (c === LF || (c === CR && text.charCodeAt(pos + 1) !== LF)) line++;
          pos++;
        }
        fieldEnd = pos;
        if (parts !== undefined) value = parts + text.slice(chunkStart, pos);
        pos++;
        if (pos < end) {
          const c = text.charCodeAt(pos);
          if (c !== COMMA && c !== LF && c !== CR) {
            throw new InputError(
              `${source}: line ${line} field ${nFields + 1} must end at its closing quote, got ${quote(text.slice(pos, pos + 10))} after it`,
            );
          }
        }
      } else {
        fieldStart = pos;
        while (pos < end) {
          const c = text.charCodeAt(pos);
          if (c === COMMA || c === LF || c === CR) break;
          pos++;
        }
        fieldEnd = pos;
        if (fieldEnd === fieldStart) fieldStart = NULL_FIELD;
      }

      if (inHeader) {
        if (header.length === MAX_TABLE_COLUMNS) {
          throw new InputError(
            `${source}: header must name at most ${MAX_TABLE_COLUMNS} columns, got more (field ${MAX_TABLE_COLUMNS + 1} on line ${line})`,
          );
        }
        header.push(value ?? (fieldStart < 0 ? '' : text.slice(fieldStart, fieldEnd)));
      } else if (nFields < nCols) {
        if (value !== undefined) {
          starts[nFields][nRows] = ESCAPED_FIELD;
          escaped[nFields].set(nRows, value);
        } else {
          starts[nFields][nRows] = fieldStart;
          ends[nFields][nRows] = fieldEnd;
        }
      }
      nFields++;

      if (pos >= end) break;
      const c = text.charCodeAt(pos++);
      if (c === COMMA) continue;
      if (c === CR && text.charCodeAt(pos) === LF) pos++;
      line++;
      break;
    }

    if (inHeader) {
      checkHeader(header, source);
      nCols = header.length;
      // A row of n fields takes at least n characters (n − 1 commas and a line end), so the rest of the
      // text holds at most (rest / n) + 1 rows: with many columns that is far fewer than its line ends.
      maxRows = Math.floor((end - pos) / nCols) + 1;
      capacity = Math.min(capacity, maxRows);
      starts = header.map(() => new Int32Array(capacity));
      ends = header.map(() => new Int32Array(capacity));
      rowLines = new Int32Array(capacity);
      escaped = header.map(() => new Map<number, string>());
      inHeader = false;
      continue;
    }
    if (nFields !== nCols) {
      const hint = nFields === 1 && starts[0][nRows] === NULL_FIELD ? ' (an empty line)' : '';
      throw new InputError(`${source}: line ${recordLine} must have ${nCols} fields like the header, got ${nFields}${hint}`);
    }
    rowLines[nRows++] = recordLine;
  }

  if (inHeader) throw new InputError(`${source}: file must have a header row, got an empty file`);
  const columns = header.map((_, j) => new CsvColumn(text, starts[j], ends[j], escaped[j], nRows));
  const lines = rowLines;
  return { header, columns, nRows, lineOfRow: (row) => lines[row] };
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

/** Line feeds in the text, or carriage returns when it has no line feed (a CR-only file). */
function countLineEnds(text: string): number {
  let n = 0;
  for (let at = text.indexOf('\n'); at >= 0; at = text.indexOf('\n', at + 1)) n++;
  if (n === 0) for (let at = text.indexOf('\r'); at >= 0; at = text.indexOf('\r', at + 1)) n++;
  return n;
}

/** True when the text from `pos` on is nothing but line ends (checked only where a line is empty). */
function onlyLineEndsFrom(text: string, pos: number): boolean {
  for (let c = text.charCodeAt(pos); c === LF || c === CR; c = text.charCodeAt(++pos));
  return pos >= text.length;
}
