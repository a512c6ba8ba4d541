import { decodeUtf8 } from './decode-utf8.js';
import { runsFromArrow, runsFromCsv } from './parse-runs.js';
import { readInputFile } from './read-input-file.js';
import type { ReadRunsOptions, RunsTable } from './runs-table.js';
import { tableFormatOf } from './table-format-of.js';

/**
 * Reads a runs table, the format chosen by extension: `.csv`, `.arrow` / `.feather` (Arrow IPC file),
 * `.arrows` (Arrow IPC stream). Every failure is a one-line InputError naming `path`.
 */
export async function readRuns(path: string, options: ReadRunsOptions): Promise<RunsTable> {
  const format = tableFormatOf(path);
  const bytes = await readInputFile(path);
  return format === 'csv' ? runsFromCsv(decodeUtf8(bytes, path), path, options) : runsFromArrow(bytes, path, options);
}
