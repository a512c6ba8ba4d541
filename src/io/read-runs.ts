import { runsFromCsv } from './runs-from-csv.js';
import { MAX_CSV_BYTES, readInputFile } from './read-input-file.js';
import type { ReadRunsOptions, RunsTable } from './runs-table.js';
import { tableFormatOf } from './table-format-of.js';

/**
 * Reads a runs table, the format chosen by extension: `.csv`, `.arrow` / `.feather` (Arrow IPC file),
 * `.arrows` (Arrow IPC stream), `.parquet`. Every failure is a one-line InputError naming `path`.
 */
export async function readRuns(path: string, options: ReadRunsOptions): Promise<RunsTable> {
  const format = tableFormatOf(path);
  if (format === 'parquet') {
    const { runsFromParquet } = await import('./parse-parquet-runs.js');
    return runsFromParquet(await readInputFile(path), path, options);
  }
  if (format !== 'csv') {
    // Apache Arrow is loaded only when an Arrow table is read (it costs most of the start-up otherwise).
    const { runsFromArrow } = await import('./parse-runs.js');
    return runsFromArrow(await readInputFile(path), path, options);
  }
  // CSV is parsed from its bytes (checked as strict UTF-8): no text copy of the file is made.
  return runsFromCsv(await readInputFile(path, MAX_CSV_BYTES), path, options);
}
