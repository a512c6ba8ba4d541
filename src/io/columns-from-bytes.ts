import { tableFromIPC, type Vector } from 'apache-arrow';
import { InputError, quote } from '../errors.js';
import { parseCsv } from './parse-csv.js';
import type { TableFormat } from './table-format-of.js';

export type Cell = string | number | bigint | boolean | null;

/** A small table by column name, whatever format it came in. */
export interface NamedColumns {
  source: string;
  nRows: number;
  names: string[];
  /** The column called `name`, or null when the table has none. */
  column(name: string): ((row: number) => Cell) | null;
  /** Where row `row` (0-based) is, for messages: `line N` (CSV) or `row N` (Arrow). */
  locate(row: number): string;
}

/**
 * Reads the bytes of a CSV or Arrow IPC table (file or stream) into columns by name. CSV values are text
 * (an empty field is null); Arrow values are plain numbers, strings, booleans or null.
 */
export function columnsFromBytes(bytes: Uint8Array, format: TableFormat, source: string): NamedColumns {
  if (format === 'csv') {
    const csv = parseCsv(bytes, source);
    return {
      source,
      nRows: csv.nRows,
      names: csv.header,
      column: (name) => {
        const j = csv.header.indexOf(name);
        return j < 0 ? null : (row) => csv.columns[j].get(row);
      },
      locate: (row) => `line ${csv.lineOfRow(row)}`,
    };
  }
  if (format === 'parquet') {
    throw new InputError(`${source}: a run summary or changes table for the report must be CSV or Arrow, got Parquet (write it as .csv or .arrow)`);
  }
  let table: ReturnType<typeof tableFromIPC>;
  try {
    table = tableFromIPC(bytes);
  } catch (err) {
    throw new InputError(`${source}: file must be an Arrow IPC table, got ${quote(String((err as Error).message ?? err))}`);
  }
  const names = table.schema.fields.map((f) => f.name);
  return {
    source,
    nRows: table.numRows,
    names,
    column: (name) => {
      const j = names.indexOf(name);
      if (j < 0) return null;
      const vector = table.getChildAt(j) as Vector;
      return (row) => plain(vector.get(row));
    },
    locate: (row) => `row ${row + 1}`,
  };
}

function plain(v: unknown): Cell {
  if (v === null || v === undefined) return null;
  if (typeof v === 'string' || typeof v === 'number' || typeof v === 'bigint' || typeof v === 'boolean') return v;
  return String(v);
}
