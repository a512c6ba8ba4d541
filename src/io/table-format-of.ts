import { extname } from 'node:path';
import { InputError, quote } from '../errors.js';

/** The table formats read and written, chosen by file extension (docs/formats.md, "Runs table"). */
export type TableFormat = 'csv' | 'arrow-file' | 'arrow-stream';

const BY_EXTENSION: Record<string, TableFormat> = {
  '.csv': 'csv',
  '.arrow': 'arrow-file',
  '.feather': 'arrow-file',
  '.arrows': 'arrow-stream',
};

/** Picks the table format from `path`'s extension (any letter case); anything else is an InputError. */
export function tableFormatOf(path: string): TableFormat {
  const ext = extname(path);
  const format = BY_EXTENSION[ext.toLowerCase()];
  if (format === undefined) {
    const supported = Object.keys(BY_EXTENSION).join(', ');
    throw new InputError(`${path}: extension must be one of ${supported}, got ${ext === '' ? 'none' : quote(ext)}`);
  }
  return format;
}
