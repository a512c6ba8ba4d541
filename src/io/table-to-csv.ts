import { checkOutputTable } from './check-output-table.js';
import type { OutputTable } from './output-table.js';

/**
 * Writes a table as CSV text (RFC 4180, section 2): a header row, LF line ends, a field in double quotes
 * (with `""` for a quote) when it holds a comma, quote or line break, or is the empty string; `null` is
 * an empty field, so it reads back as null and `""` as the empty string. Numbers use `String(number)`,
 * the shortest text that reads back as the same float.
 */
export function tableToCsv(table: OutputTable): string {
  return [...csvChunks(table)].join('');
}

/** The CSV text of `table` in pieces of `rowsPerChunk` rows (the header is the first piece), for streaming. */
export function* csvChunks(table: OutputTable, rowsPerChunk = 8192, where = 'output table'): Generator<string> {
  checkOutputTable(table, where);
  const { columns, nRows } = table;
  yield `${columns.map((column) => csvField(column.name)).join(',')}\n`;
  const nCols = columns.length;
  for (let first = 0; first < nRows; first += rowsPerChunk) {
    const last = Math.min(nRows, first + rowsPerChunk);
    // Joined arrays give flat strings (repeated `+=` builds deep concatenation trees, slow to write out).
    const lines = new Array<string>(last - first + 1);
    const fields = new Array<string>(nCols);
    for (let row = first; row < last; row++) {
      for (let j = 0; j < nCols; j++) fields[j] = csvField(columns[j].get(row));
      lines[row - first] = fields.join(',');
    }
    lines[last - first] = '';
    yield lines.join('\n');
  }
}

const NEEDS_QUOTES = /[",\r\n]/;

function csvField(value: string | number | bigint | boolean | null): string {
  if (value === null || value === undefined) return '';
  if (typeof value !== 'string') return String(value);
  if (value === '' || NEEDS_QUOTES.test(value)) return `"${value.replace(/"/g, '""')}"`;
  return value;
}
