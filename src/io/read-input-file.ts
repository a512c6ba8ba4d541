import { readFile } from 'node:fs/promises';
import { InputError } from '../errors.js';

/**
 * Reads a whole input file, turning the usual file-system failures into one-line InputErrors that name
 * the path (a missing file, a folder, no permission).
 */
export async function readInputFile(path: string): Promise<Uint8Array> {
  try {
    return await readFile(path);
  } catch (err) {
    throw new InputError(`${path}: ${describeReadFailure(err)}`);
  }
}

function describeReadFailure(err: unknown): string {
  const code = (err as NodeJS.ErrnoException).code;
  switch (code) {
    case 'ENOENT':
      return 'file must exist, got no such file';
    case 'EISDIR':
      return 'file must be a file, got a folder';
    case 'EACCES':
    case 'EPERM':
      return 'file must be readable, got permission denied';
    case 'ENOTDIR':
      return 'file must exist, got a path through something that is not a folder';
    default:
      return `file must be readable, got ${code ?? 'an error'} (${String((err as Error).message).replace(/\s+/g, ' ')})`;
  }
}
