import { buildRunsTable } from './build-runs-table.js';
import { parseCsv, type CsvTable } from './parse-csv.js';
import { resolveKeyColumns } from './resolve-key-columns.js';
import type { InputColumn, ReadRunsOptions, RunsTable } from './runs-table.js';

/**
 * Reads a runs table from CSV (docs/formats.md, "Runs table"): the file's bytes (strict UTF-8) or its
 * text. Every column is kept as text (`kind: 'utf8'`); an empty unquoted field is null. Messages locate
 * rows by file line.
 */
export function runsFromCsv(input: string | Uint8Array, source: string, options: ReadRunsOptions): RunsTable {
  const csv = parseCsv(input, source);
  const columns: InputColumn[] = csv.header.map((name, j) => {
    const column = csv.columns[j];
    return { name, kind: 'utf8', get: (row: number) => column.get(row) };
  });
  const keys = resolveKeyColumns(csv.header, options, source);
  const [run, step, reading] = [keys.runCol, keys.timeCol ?? keys.stepCol, keys.readingCol].map((name) => csv.header.indexOf(name));
  return buildRunsTable(
    {
      source,
      nRows: csv.nRows,
      columns,
      ...keys,
      runAt: csvText(csv, run, []),
      stepAt: (row) => {
        csv.seek(row);
        const start = csv.fieldStart[step];
        const value = start >= 0 ? csv.digits(start, csv.fieldEnd[step]) : -1;
        return value >= 0 ? value : csv.columns[step].get(row);
      },
      ...(keys.timeCol !== undefined ? { timeCol: keys.timeCol } : {}),
      readingAt: csvText(csv, reading, options.surfaces),
      locate: (row) => `line ${csv.lineOfRow(row)}`,
    },
    options,
  );
}

/**
 * Reads text column `j` row by row, in row order, without making a string per row: a field equal to the
 * previous row's returns the same string (a run's id is decoded once per run), a field equal to one of
 * `known` (the surfaces) returns that string; only other fields are decoded.
 */
function csvText(csv: CsvTable, j: number, known: readonly string[]): (row: number) => string | null {
  const knownBytes = known.map((value) => csv.encoded(value));
  let lastStart = 0;
  let lastEnd = -1;
  let last: string | null = null;
  return (row) => {
    csv.seek(row);
    const start = csv.fieldStart[j];
    if (start >= 0) {
      const end = csv.fieldEnd[j];
      if (lastEnd >= 0 && csv.rangesEqual(start, end, lastStart, lastEnd)) return last;
      let k = 0;
      while (k < knownBytes.length && !csv.bytesEqual(start, end, knownBytes[k])) k++;
      last = k < knownBytes.length ? known[k] : csv.slice(start, end);
      lastStart = start;
      lastEnd = end;
      return last;
    }
    // Null or undoubled (escaped) fields: never the same span as another row's.
    lastEnd = -1;
    last = start === -1 ? null : (csv.fieldValue[j] as string);
    return last;
  };
}
