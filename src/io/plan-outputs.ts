import { constants } from 'node:fs';
import { access, lstat, realpath, stat } from 'node:fs/promises';
import { basename, dirname, resolve } from 'node:path';
import type { Stats } from 'node:fs';
import { InputError } from '../errors.js';

/** One file a command reads or writes, with the option (or pipeline key) that named it, for messages. */
export interface NamedPath {
  /** The path as given; empty or null entries are skipped. */
  path: string | null | undefined;
  /** How the user named it: `--out`, `--runs`, `"out.model"`, … */
  what: string;
}

/** Where an output will land, resolved: the real folder and name, and the file there now, if any. */
interface Resolved {
  named: NamedPath;
  /** Real path (symlinks and `.`/`..` resolved) of the file, or of its real parent folder + name for a new path. */
  real: string;
  /** `dev:ino` of the existing file (symlinks followed), or null for a new path. */
  id: string | null;
}

/**
 * Checks a command's outputs against its inputs and each other BEFORE any work, so nothing is read,
 * computed or written when they clash. Every output must be a regular file or a new path in a folder
 * that exists or can be created and is writable; it must not be one of the inputs (compared by the
 * real path and by device and inode, so `./x`, `a/../x`, symlinks and hard links are caught), nor
 * another output. Devices (`/dev/null`), folders, sockets and FIFOs are refused: an atomic write
 * renames a new file over the path and would replace them. Every clash is one line, `<where>: <output
 * option> must …, got …` (InputError). Inputs that do not exist are skipped (their reader reports them).
 */
export async function planOutputs(where: string, inputs: NamedPath[], outputs: NamedPath[]): Promise<void> {
  const inputIds = new Map<string, NamedPath>();
  const inputReal = new Map<string, NamedPath>();
  for (const input of inputs) {
    if (!input.path || input.path === '-') continue;
    const st = await statOrNull(input.path);
    if (!st) continue;
    inputIds.set(idOf(st), input);
    inputReal.set(await realpath(input.path).catch(() => resolve(input.path!)), input);
  }
  const seen: Resolved[] = [];
  let toStdout: NamedPath | null = null;
  for (const output of outputs) {
    if (!output.path) continue;
    if (output.path === '-') {
      // Standard output: at most one output may go there.
      if (toStdout) throw new InputError(`${where}: ${output.what} must differ from every other output, got -, standard output like ${toStdout.what}`);
      toStdout = output;
      continue;
    }
    const r = await resolveOutput(where, output);
    const sameInput = (r.id ? inputIds.get(r.id) : undefined) ?? inputReal.get(r.real);
    if (sameInput) {
      throw new InputError(
        `${where}: ${output.what} must not name an input, got ${output.path}, the same file as ${sameInput.what} ${sameInput.path}`,
      );
    }
    const sameOutput = seen.find((o) => o.real === r.real || (r.id !== null && o.id === r.id));
    if (sameOutput) {
      throw new InputError(
        `${where}: ${output.what} must differ from every other output, got ${output.path}, the same file as ${sameOutput.named.what} ${sameOutput.named.path}`,
      );
    }
    seen.push(r);
  }
}

async function resolveOutput(where: string, output: NamedPath): Promise<Resolved> {
  const path = output.path!;
  const fail = (got: string): never => {
    throw new InputError(`${where}: ${output.what} must be a regular file or a new file path, got ${path}, ${got}`);
  };
  const link = await lstatOrNull(path);
  if (link) {
    const st = await statOrNull(path);
    if (!st) fail('a symbolic link to nothing');
    if (!st!.isFile()) fail(describeKind(st!));
    const real = await realpath(path);
    await checkWritable(where, output, dirname(path));
    return { named: output, real, id: idOf(st!) };
  }
  // A new file: its folder is the nearest existing ancestor (missing folders are created when writing).
  let folder = dirname(resolve(path));
  const missing: string[] = [basename(path)];
  for (;;) {
    const st = await statOrNull(folder);
    if (st) {
      if (!st.isDirectory()) fail(`a path through ${folder}, which is not a folder`);
      break;
    }
    const parent = dirname(folder);
    if (parent === folder) break;
    missing.unshift(basename(folder));
    folder = parent;
  }
  await checkWritable(where, output, folder);
  const real = resolve(await realpath(folder).catch(() => folder), ...missing);
  return { named: output, real, id: null };
}

async function checkWritable(where: string, output: NamedPath, folder: string): Promise<void> {
  try {
    await access(folder, constants.W_OK | constants.X_OK);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return; // created on write, if it can be
    throw new InputError(`${where}: ${output.what} must lie in a writable folder, got ${output.path} in ${folder} (${code ?? 'not writable'})`);
  }
}

function describeKind(st: Stats): string {
  if (st.isDirectory()) return 'a folder';
  if (st.isCharacterDevice()) return 'a character device';
  if (st.isBlockDevice()) return 'a block device';
  if (st.isFIFO()) return 'a FIFO (named pipe)';
  if (st.isSocket()) return 'a socket';
  return 'not a regular file';
}

function idOf(st: Stats): string {
  return `${st.dev}:${st.ino}`;
}

async function statOrNull(path: string): Promise<Stats | null> {
  try {
    return await stat(path);
  } catch {
    return null;
  }
}

async function lstatOrNull(path: string): Promise<Stats | null> {
  try {
    return await lstat(path);
  } catch {
    return null;
  }
}
