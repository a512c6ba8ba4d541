import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';

/** SHA-256 of a file's bytes, as `sha256:<hex>` (recorded in model provenance). */
export async function fileDigest(path: string): Promise<string> {
  return `sha256:${createHash('sha256').update(await readFile(path)).digest('hex')}`;
}
