import { buildRunsTable } from './build-runs-table.js';
import { parseCsv, type CsvColumn } from './parse-csv.js';
import { resolveKeyColumns } from './resolve-key-columns.js';
import type { InputColumn, ReadRunsOptions, RunsTable } from './runs-table.js';

/**
 * Reads a runs table from CSV text (docs/formats.md, "Runs table"). Every column is kept as text
 * (`kind: 'utf8'`); an empty unquoted field is null. Messages locate rows by file line.
 */
export function runsFromCsv(text: string, source: string, options: ReadRunsOptions): RunsTable {
  const csv = parseCsv(text, source);
  const columns: InputColumn[] = csv.header.map((name, j) => {
    const column = csv.columns[j];
    return { name, kind: 'utf8', get: (row: number) => column.get(row) };
  });
  const keys = resolveKeyColumns(csv.header, options, source);
  const [run, step, reading] = [keys.runCol, keys.timeCol ?? keys.stepCol, keys.readingCol].map(
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
      ...(keys.timeCol !== undefined ? { timeCol: keys.timeCol } : {}),
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
