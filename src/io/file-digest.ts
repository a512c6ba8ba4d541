import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { streamDigests } from './read-input-file.js';

/**
 * SHA-256 of a file's bytes, as `sha256:<hex>` (recorded in model provenance). An input that is not a
 * regular file (a FIFO) was digested when it was read (`readInputFile`) and is not opened again.
 */
export async function fileDigest(path: string): Promise<string> {
  const known = streamDigests.get(path);
  if (known !== undefined && (path === '-' || !(await stat(path).catch(() => null))?.isFile())) return known;
  return `sha256:${createHash('sha256').update(await readFile(path)).digest('hex')}`;
}
