import { createHash } from 'node:crypto';
import { open, type FileHandle } from 'node:fs/promises';
import { InputError } from '../errors.js';

/** Largest JSON input (floor, model, pipeline, checkpoint) read: 256 MiB. */
export const MAX_JSON_BYTES = 256 * 1024 * 1024;

/** Largest runs or other table read: 2 GiB (a Node buffer's practical limit; larger tables: split them). */
export const MAX_TABLE_BYTES = 2 * 1024 * 1024 * 1024;

/**
 * Largest CSV table read: 1 GiB. The parser keeps the bytes and locates rows by 32-bit byte offsets,
 * and a column's values must stay well within what JavaScript strings hold; reading stops here rather
 * than at 2 GiB.
 */
export const MAX_CSV_BYTES = 1024 * 1024 * 1024;

const CHUNK = 1024 * 1024;

/**
 * Digests of inputs that are not regular files (a FIFO, `<(…)`, a device), taken from the bytes read:
 * such an input can be read only once, so `fileDigest` must not open it again (it would block or read
 * nothing).
 */
export const streamDigests = new Map<string, string>();

/**
 * Reads a whole input file, turning the usual file-system failures into one-line InputErrors that name
 * the path (a missing file, a folder, no permission). At most `maxBytes` are read: a regular file
 * larger than that is refused before reading, and anything else (a FIFO, `/dev/zero`, a pipe that never
 * ends) is read in chunks and refused as soon as it passes the cap, so memory never grows past it.
 */
export async function readInputFile(path: string, maxBytes: number = MAX_TABLE_BYTES, what = 'file'): Promise<Uint8Array> {
  if (path === '-') return readStandardInput(maxBytes, what);
  let handle: FileHandle | undefined;
  try {
    handle = await open(path, 'r');
    const stat = await handle.stat();
    if (stat.isDirectory()) throw Object.assign(new Error('folder'), { code: 'EISDIR' });
    if (stat.isFile() && stat.size > maxBytes) throw tooLarge(path, maxBytes, `${stat.size} bytes`, what);
    const chunks: Buffer[] = [];
    let total = 0;
    if (stat.isFile() && stat.size > 0) {
      // A regular file is read into one buffer of its size (no second copy), then read on in case it grew.
      const whole = Buffer.allocUnsafe(stat.size);
      while (total < whole.length) {
        const { bytesRead } = await handle.read(whole, total, whole.length - total, null);
        if (bytesRead === 0) break;
        total += bytesRead;
      }
      chunks.push(total === whole.length ? whole : whole.subarray(0, total));
    }
    for (;;) {
      const want = Math.min(CHUNK, maxBytes + 1 - total);
      const buf = Buffer.allocUnsafe(Math.max(1, want));
      const { bytesRead } = await handle.read(buf, 0, buf.length, null);
      if (bytesRead === 0) break;
      total += bytesRead;
      if (total > maxBytes) throw tooLarge(path, maxBytes, 'more', what);
      chunks.push(bytesRead === buf.length ? buf : buf.subarray(0, bytesRead));
    }
    const bytes = chunks.length === 1 ? chunks[0] : Buffer.concat(chunks, total);
    if (!stat.isFile()) streamDigests.set(path, `sha256:${createHash('sha256').update(bytes).digest('hex')}`);
    return bytes;
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError(`${path}: ${describeReadFailure(err, what)}`);
  } finally {
    await handle?.close().catch(() => undefined);
  }
}

function tooLarge(path: string, maxBytes: number, got: string, what: string): InputError {
  return new InputError(`${path}: ${what} must be at most ${formatBytes(maxBytes)} (${maxBytes} bytes), got ${got}`);
}

function formatBytes(n: number): string {
  return n >= 1024 ** 3 ? `${n / 1024 ** 3} GiB` : `${n / 1024 ** 2} MiB`;
}

function describeReadFailure(err: unknown, what: string): string {
  const code = (err as NodeJS.ErrnoException).code;
  switch (code) {
    case 'ENOENT':
      return `${what} must exist, got no such file`;
    case 'EISDIR':
      return `${what} must be a file, got a folder`;
    case 'EACCES':
    case 'EPERM':
      return `${what} must be readable, got permission denied`;
    case 'ENOTDIR':
      return `${what} must exist, got a path through something that is not a folder`;
    default:
      return `${what} must be readable, got ${code ?? 'an error'} (${String((err as Error).message).replace(/\s+/g, ' ')})`;
  }
}

let stdinRead = false;

/**
 * Standard input (`-`), read once to its end (at most `maxBytes`); its digest is kept like a FIFO's.
 * A second read in the same command is an error (the bytes are gone).
 */
async function readStandardInput(maxBytes: number, what: string): Promise<Uint8Array> {
  if (stdinRead) throw new InputError(`-: standard input must be named once, got it again (it can be read only once)`);
  stdinRead = true;
  const chunks: Buffer[] = [];
  let total = 0;
  for await (const chunk of process.stdin as AsyncIterable<Buffer>) {
    total += chunk.length;
    if (total > maxBytes) {
      process.stdin.destroy();
      throw tooLarge('-', maxBytes, 'more', what);
    }
    chunks.push(chunk);
  }
  const bytes = Buffer.concat(chunks, total);
  streamDigests.set('-', `sha256:${createHash('sha256').update(bytes).digest('hex')}`);
  return bytes;
}
