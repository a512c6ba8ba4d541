import { randomBytes } from 'node:crypto';
import { unlinkSync } from 'node:fs';
import { mkdir, open, readdir, rename, rm, type FileHandle } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { InputError, WorkError } from '../errors.js';

/** Temporary files being written by this process right now (removed by `removeTemporaryFiles` on exit). */
const live = new Set<string>();

/**
 * Removes, synchronously, every temporary file this process is writing: called by the CLI when it
 * exits on a signal (SIGINT, SIGTERM), a closed pipe or any other way, so no `*.tmp-*` file is left.
 */
export function removeTemporaryFiles(): void {
  for (const temp of live) {
    try {
      unlinkSync(temp);
    } catch {
      // Already renamed into place or removed.
    }
  }
  live.clear();
}

/** What `writeFileAtomic` writes: text (as UTF-8), bytes, or a sequence of either written in order. */
export type FileData = string | Uint8Array | Iterable<string | Uint8Array>;

/**
 * Writes `data` to `path` so that readers see the old file or the whole new one, never a part: the data
 * goes to `<base>.tmp-<pid>-<random>` in the same folder, is flushed to disk (fsync), then renamed over
 * `path`. On failure the temporary file is removed and the old file is left as it was. Missing parent
 * folders are created. File-system failures become one-line errors naming `path` (InputError when the
 * path itself is unusable, WorkError otherwise); other errors (e.g. thrown while producing `data`)
 * pass through unchanged.
 */
export async function writeFileAtomic(path: string, data: FileData): Promise<void> {
  const folder = dirname(path);
  try {
    await mkdir(folder, { recursive: true });
  } catch (err) {
    throw fileError(path, err, 'folder');
  }
  await removeStaleTemporaries(folder, basename(path));
  const temp = join(folder, `${basename(path)}.tmp-${process.pid}-${randomBytes(6).toString('hex')}`);
  let handle: FileHandle | undefined;
  live.add(temp);
  try {
    handle = await open(temp, 'wx');
    const chunks = typeof data === 'string' || data instanceof Uint8Array ? [data] : data;
    for (const chunk of chunks) await writeAll(handle, chunk);
    await handle.sync();
    await handle.close();
    handle = undefined;
    await rename(temp, path);
    live.delete(temp);
  } catch (err) {
    await handle?.close().catch(() => undefined);
    await rm(temp, { force: true }).catch(() => undefined);
    live.delete(temp);
    throw isFileSystemError(err) ? fileError(path, err, 'file') : err;
  }
  await syncFolder(folder);
}

/**
 * Removes temporary files left for the same target by a process that no longer runs (one killed while
 * writing). Files of live processes, and anything not named `<base>.tmp-<pid>-<hex>`, are left alone.
 */
async function removeStaleTemporaries(folder: string, base: string): Promise<void> {
  let names: string[];
  try {
    names = await readdir(folder);
  } catch {
    return;
  }
  const prefix = `${base}.tmp-`;
  for (const name of names) {
    if (!name.startsWith(prefix)) continue;
    const m = /^(\d+)-[0-9a-f]+$/.exec(name.slice(prefix.length));
    if (!m) continue;
    const pid = Number(m[1]);
    if (pid === process.pid || isRunning(pid)) continue;
    await rm(join(folder, name), { force: true }).catch(() => undefined);
  }
}

function isRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Writes the whole chunk at the current position (a single write may take only part of it). */
async function writeAll(handle: FileHandle, chunk: string | Uint8Array): Promise<void> {
  const bytes = typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : chunk;
  for (let offset = 0; offset < bytes.length; ) {
    const { bytesWritten } = await handle.write(bytes, offset, bytes.length - offset);
    offset += bytesWritten;
  }
}

/** Flushes the folder entry so the rename survives a crash; some systems refuse, which is harmless. */
async function syncFolder(folder: string): Promise<void> {
  let handle: FileHandle | undefined;
  try {
    handle = await open(folder, 'r');
    await handle.sync();
  } catch {
    // Not supported everywhere (e.g. on some network or Windows file systems).
  } finally {
    await handle?.close().catch(() => undefined);
  }
}

function isFileSystemError(err: unknown): err is NodeJS.ErrnoException {
  return err instanceof Error && typeof (err as NodeJS.ErrnoException).syscall === 'string';
}

function fileError(path: string, err: unknown, what: 'file' | 'folder'): Error {
  const code = (err as NodeJS.ErrnoException).code;
  const where = what === 'folder' ? `${path}: output folder` : `${path}: output`;
  switch (code) {
    case 'EISDIR':
    case 'ENOTEMPTY':
    case 'EEXIST':
      return new InputError(
        what === 'folder' ? `${where} must be creatable, got a file in the way` : `${where} must be a file path, got a folder`,
      );
    case 'ENOTDIR':
      return new InputError(`${where} must lie in a folder, got a path through a file`);
    case 'EACCES':
    case 'EPERM':
    case 'EROFS':
      return new InputError(`${where} must be writable, got ${code === 'EROFS' ? 'a read-only file system' : 'permission denied'}`);
    default: {
      const why = String((err as Error).message).replace(/\s+/g, ' ');
      return new WorkError(`${where} must be written, got ${code ?? 'an error'} (${why})`);
    }
  }
}
