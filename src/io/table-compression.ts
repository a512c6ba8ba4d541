import { InputError, quote } from '../errors.js';
import { tableFormatOf, type TableFormat } from './table-format-of.js';

/**
 * Compression of written tables (`--compression`): zstd or LZ4 frames for Arrow IPC bodies (the Arrow
 * IPC format's BodyCompression), zstd pages for Parquet. CSV is never compressed.
 */
export type TableCompression = 'zstd' | 'lz4';

let chosen: TableCompression | null = null;

/**
 * Sets the compression of the tables a command writes, from its `--compression` (`zstd`, `lz4`, `none`;
 * null/undefined = none). Called once per command, before any output is checked or written.
 */
export function setTableCompression(name: string | null | undefined, where: string): void {
  if (name === null || name === undefined) {
    chosen = null;
    return;
  }
  const n = name.toLowerCase();
  if (n !== 'zstd' && n !== 'lz4' && n !== 'none') {
    throw new InputError(`${where}: --compression must be one of zstd, lz4, none, got ${quote(name)}`);
  }
  chosen = n === 'none' ? null : n;
}

/** The compression set by `setTableCompression` (null: none). */
export function tableCompression(): TableCompression | null {
  return chosen;
}

/**
 * The format of output table `path` (by extension, or `--format` for `-`), checked against the
 * compression before any work: a CSV output cannot be compressed, a Parquet output only with zstd.
 */
export function outputTableFormatOf(path: string, compression: TableCompression | null = chosen): TableFormat {
  const format = tableFormatOf(path);
  if (compression === null) return format;
  if (format === 'csv') {
    throw new InputError(`${path}: --compression ${compression} must go with an Arrow (.arrow, .feather, .arrows) or Parquet output, got a CSV output`);
  }
  if (format === 'parquet' && compression !== 'zstd') {
    throw new InputError(`${path}: --compression of a Parquet output must be zstd, got ${compression} (LZ4 frames are for Arrow outputs)`);
  }
  return format;
}
