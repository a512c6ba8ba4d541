import { extname } from 'node:path';
import { InputError, quote } from '../errors.js';

/** The table formats read and written, chosen by file extension (docs/formats.md, "Runs table"). */
export type TableFormat = 'csv' | 'arrow-file' | 'arrow-stream' | 'parquet';

const BY_EXTENSION: Record<string, TableFormat> = {
  '.csv': 'csv',
  '.arrow': 'arrow-file',
  '.feather': 'arrow-file',
  '.arrows': 'arrow-stream',
  '.parquet': 'parquet',
};

/** The path that means standard input (for an input) or standard output (for an output). */
export const STDIO_PATH = '-';

/** The `--format` names and the formats they choose for `-`. */
export const FORMAT_NAMES: Record<string, TableFormat> = { csv: 'csv', arrow: 'arrow-file', feather: 'arrow-file', arrows: 'arrow-stream', parquet: 'parquet' };

let stdioFormat: TableFormat | null = null;

/**
 * Sets the format of tables read from standard input or written to standard output (`-`), from the
 * command's `--format` (null: none given). Called once per command, before any table is named.
 */
export function setStdioTableFormat(name: string | null | undefined, where: string): void {
  if (name === null || name === undefined) {
    stdioFormat = null;
    return;
  }
  const format = FORMAT_NAMES[name.toLowerCase()];
  if (format === undefined) {
    throw new InputError(`${where}: --format must be one of ${Object.keys(FORMAT_NAMES).join(', ')}, got ${quote(name)}`);
  }
  stdioFormat = format;
}

/**
 * Picks the table format from `path`'s extension (any letter case); `-` (standard input or output)
 * takes the `--format` given. Anything else is an InputError.
 */
export function tableFormatOf(path: string): TableFormat {
  if (path === STDIO_PATH) {
    if (stdioFormat === null) {
      throw new InputError(`-: a table on standard input or output must come with --format (${Object.keys(FORMAT_NAMES).join(', ')}), got no --format`);
    }
    return stdioFormat;
  }
  const ext = extname(path);
  const format = BY_EXTENSION[ext.toLowerCase()];
  if (format === undefined) {
    const supported = Object.keys(BY_EXTENSION).join(', ');
    throw new InputError(`${path}: extension must be one of ${supported}, got ${ext === '' ? 'none' : quote(ext)}`);
  }
  return format;
}
