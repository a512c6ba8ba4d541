import type { OutputTable } from './output-table.js';
import { tableFormatOf } from './table-format-of.js';
import { csvChunks } from './table-to-csv.js';
import { writeFileAtomic } from './write-atomic.js';

/**
 * Writes `table` atomically, the format chosen by extension: `.csv` (see `tableToCsv`, streamed in
 * pieces), `.arrow` / `.feather` (Arrow IPC file) or `.arrows` (Arrow IPC stream; see
 * `tableToArrowBytes`). Problems with the table are reported before anything is written.
 */
export async function writeTable(path: string, table: OutputTable): Promise<void> {
  const format = tableFormatOf(path);
  if (format === 'csv') {
    const chunks = csvChunks(table, 8192, path);
    // Draw the header first so a bad table fails before a temporary file is made.
    const header = chunks.next();
    await writeFileAtomic(path, prepend(header.done ? '' : header.value, chunks));
    return;
  }
  // Apache Arrow is loaded only when an Arrow table is written (start-up time).
  const { tableToArrowBytes } = await import('./table-to-arrow-bytes.js');
  await writeFileAtomic(path, tableToArrowBytes(table, format === 'arrow-stream', path));
}

function* prepend(first: string, rest: Iterator<string>): Generator<string> {
  yield first;
  for (let next = rest.next(); !next.done; next = rest.next()) yield next.value;
}
