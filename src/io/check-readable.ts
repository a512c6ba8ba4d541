import { access, constants } from 'node:fs/promises';
import { InputError } from '../errors.js';

/** Fails with one line when an input file is missing or unreadable (used before any work starts). */
export async function checkReadable(path: string, what: string): Promise<void> {
  if (path === '-') return; // standard input
  try {
    await access(path, constants.R_OK);
  } catch (err) {
    throw new InputError(`${path}: the ${what} must exist and be readable, got ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
}
