import type { OutputTable } from './output-table.js';
import { STDIO_PATH, type TableFormat } from './table-format-of.js';
import { outputTableFormatOf, tableCompression, type TableCompression } from './table-compression.js';
import { csvChunks } from './table-to-csv.js';
import { writeFileAtomic } from './write-atomic.js';

/**
 * Writes `table` atomically, the format chosen by extension: `.csv` (see `tableToCsv`, streamed in
 * pieces), `.arrow` / `.feather` (Arrow IPC file) or `.arrows` (Arrow IPC stream; see
 * `tableToArrowBytes`) or `.parquet`. `compression` (default: the command's `--compression`, see
 * `setTableCompression`) compresses Arrow bodies (zstd, LZ4 frame) or Parquet pages (zstd). Problems with
 * the table are reported before anything is written.
 */
export async function writeTable(path: string, table: OutputTable, options: { compression?: TableCompression | null } = {}): Promise<void> {
  const compression = options.compression === undefined ? tableCompression() : options.compression;
  const format = outputTableFormatOf(path, compression);
  if (path === STDIO_PATH) {
    await writeStandardOutput(format === 'csv' ? csvChunks(table, 8192, path) : [await binaryBytes(table, format, path, compression)]);
    return;
  }
  if (format === 'csv') {
    const chunks = csvChunks(table, 8192, path);
    // Draw the header first so a bad table fails before a temporary file is made.
    const header = chunks.next();
    await writeFileAtomic(path, prepend(header.done ? '' : header.value, chunks));
    return;
  }
  await writeFileAtomic(path, await binaryBytes(table, format, path, compression));
}

/** Parquet or Arrow bytes; their libraries are loaded only when such a table is written (start-up time). */
async function binaryBytes(table: OutputTable, format: TableFormat, path: string, compression: TableCompression | null): Promise<Uint8Array> {
  if (format === 'parquet') {
    const zstd = compression === 'zstd' ? await (await import('./zstd-compressor.js')).loadZstdCompressor() : undefined;
    return (await import('./table-to-parquet-bytes.js')).tableToParquetBytes(table, path, table.metadata, zstd);
  }
  const type = compression === null ? null : await (await import('./arrow-codecs.js')).registerArrowEncoder(compression);
  return (await import('./table-to-arrow-bytes.js')).tableToArrowBytes(table, format === 'arrow-stream', path, type);
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
