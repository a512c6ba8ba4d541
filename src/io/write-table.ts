import type { OutputTable } from './output-table.js';
import { STDIO_PATH, tableFormatOf, type TableFormat } from './table-format-of.js';
import { csvChunks } from './table-to-csv.js';
import { writeFileAtomic } from './write-atomic.js';

/**
 * Writes `table` atomically, the format chosen by extension: `.csv` (see `tableToCsv`, streamed in
 * pieces), `.arrow` / `.feather` (Arrow IPC file) or `.arrows` (Arrow IPC stream; see
 * `tableToArrowBytes`). Problems with the table are reported before anything is written.
 */
export async function writeTable(path: string, table: OutputTable): Promise<void> {
  const format = tableFormatOf(path);
  if (path === STDIO_PATH) {
    await writeStandardOutput(format === 'csv' ? csvChunks(table, 8192, path) : [await binaryBytes(table, format, path)]);
    return;
  }
  if (format === 'csv') {
    const chunks = csvChunks(table, 8192, path);
    // Draw the header first so a bad table fails before a temporary file is made.
    const header = chunks.next();
    await writeFileAtomic(path, prepend(header.done ? '' : header.value, chunks));
    return;
  }
  await writeFileAtomic(path, await binaryBytes(table, format, path));
}

/** Parquet or Arrow bytes; their libraries are loaded only when such a table is written (start-up time). */
async function binaryBytes(table: OutputTable, format: TableFormat, path: string): Promise<Uint8Array> {
  if (format === 'parquet') return (await import('./table-to-parquet-bytes.js')).tableToParquetBytes(table, path, table.metadata);
  return (await import('./table-to-arrow-bytes.js')).tableToArrowBytes(table, format === 'arrow-stream', path);
}

function* prepend(first: string, rest: Iterator<string>): Generator<string> {
  yield first;
  for (let next = rest.next(); !next.done; next = rest.next()) yield next.value;
}

/**
 * Writes pieces to standard output (`-`), waiting for the pipe to drain; not atomic (a reader sees the
 * table as it comes). Problems with the table are found before the first piece (CSV: its header).
 */
async function writeStandardOutput(pieces: Iterable<string | Uint8Array>): Promise<void> {
  const out = process.stdout;
  for (const piece of pieces) {
    if (!out.write(piece)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
  }
}
