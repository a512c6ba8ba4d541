import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { writeFileAtomic } from '../../src/io/write-atomic.js';

// Source for the behaviour: the file formats (docs/formats.md), "Files the tool writes" (temporary file, then
// rename; a failed command never leaves a half-written output where a good one was expected).

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'underfoot-write-atomic-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function tempLeftovers(folder: string): Promise<string[]> {
  return (await readdir(folder)).filter((name) => name.includes('.tmp-'));
}

describe('writeFileAtomic(path, data)', () => {
  it('writeFileAtomic(path, text) writes the file and leaves no temporary file', async () => {
    const path = join(dir, 'model.json');
    await writeFileAtomic(path, '{"ok":true}\n');
    expect(await readFile(path, 'utf8')).toBe('{"ok":true}\n');
    expect(await tempLeftovers(dir)).toEqual([]);
  });

  it('writeFileAtomic(path, bytes) replaces an existing file', async () => {
    const path = join(dir, 'table.arrow');
    await writeFile(path, 'old');
    await writeFileAtomic(path, new Uint8Array([1, 2, 3]));
    expect([...(await readFile(path))]).toEqual([1, 2, 3]);
    expect(await tempLeftovers(dir)).toEqual([]);
  });

  it('writeFileAtomic(path, chunks) writes a sequence of text and bytes in order', async () => {
    const path = join(dir, 'chunks.txt');
    await writeFileAtomic(path, ['é,', new TextEncoder().encode('b'), '\n']);
    expect(await readFile(path, 'utf8')).toBe('é,b\n');
  });

  it('writeFileAtomic(path, data) creates missing parent folders', async () => {
    const path = join(dir, 'deep', 'er', 'out.csv');
    await writeFileAtomic(path, 'a\n');
    expect(await readFile(path, 'utf8')).toBe('a\n');
  });

  it('writeFileAtomic(path, data) keeps the old file and removes the temporary one when the data fails midway', async () => {
    const folder = join(dir, 'failing');
    await mkdir(folder);
    const path = join(folder, 'annotated.csv');
    await writeFile(path, 'good old content\n');
    function* failing(): Generator<string> {
      yield 'half of a new ';
      throw new Error('decoder crashed');
    }
    await expect(writeFileAtomic(path, failing())).rejects.toThrow('decoder crashed');
    expect(await readFile(path, 'utf8')).toBe('good old content\n');
    expect(await tempLeftovers(folder)).toEqual([]);
  });

  it('writeFileAtomic(path, data) rejects a folder as target with one line and leaves nothing behind', async () => {
    const target = join(dir, 'is-a-folder');
    await mkdir(target);
    await writeFile(join(target, 'inside.txt'), 'keep');
    const error = await writeFileAtomic(target, 'x').catch((err: unknown) => err);
    expect(error).toBeInstanceOf(InputError);
    expect((error as Error).message).toBe(`${target}: output must be a file path, got a folder`);
    expect(await readFile(join(target, 'inside.txt'), 'utf8')).toBe('keep');
    expect(await tempLeftovers(dir)).toEqual([]);
  });

  it('writeFileAtomic(path, data) rejects a path whose parent is a file', async () => {
    const file = join(dir, 'plain.txt');
    await writeFile(file, 'x');
    const error = await writeFileAtomic(join(file, 'out.csv'), 'x').catch((err: unknown) => err);
    expect(error).toBeInstanceOf(InputError);
    expect((error as Error).message).toBe(`${join(file, 'out.csv')}: output folder must be creatable, got a file in the way`);
  });
});
