import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { readFloor } from '../../src/io/read-floor.js';

// Source: the file formats (docs/formats.md), "Floor file". Invented place: "Quillan Annex".

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'underfoot-read-floor-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const floorText = JSON.stringify({
  format: 'underfoot-floor/1',
  name: 'Quillan Annex',
  surfaces: ['rubber', 'concrete'],
  cells: [
    { id: 'Q1', surface: 'rubber', x: 0, y: 0 },
    { id: 'Q2', surface: 'concrete', x: 1, y: 0 },
  ],
  links: [{ from: 'Q1', to: 'Q2' }],
});

async function messageOf(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
  throw new Error('expected an InputError');
}

describe('readFloor(path)', () => {
  it('readFloor(path) reads and validates a floor file', async () => {
    const path = join(dir, 'floor.json');
    await writeFile(path, floorText);
    const floor = await readFloor(path);
    expect(floor.name).toBe('Quillan Annex');
    expect(floor.cells.map((c) => c.id)).toEqual(['Q1', 'Q2']);
  });

  it('readFloor(path) rejects a missing file naming the path', async () => {
    const path = join(dir, 'nowhere.json');
    expect(await messageOf(readFloor(path))).toBe(`${path}: file must exist, got no such file`);
  });

  it('readFloor(path) rejects a folder', async () => {
    expect(await messageOf(readFloor(dir))).toBe(`${dir}: file must be a file, got a folder`);
  });

  it('readFloor(path) rejects bytes that are not UTF-8', async () => {
    const path = join(dir, 'latin1.json');
    await writeFile(path, Buffer.from([0x7b, 0xe9, 0x7d]));
    expect(await messageOf(readFloor(path))).toBe(`${path}: file must be UTF-8 text, got bytes that are not valid UTF-8`);
  });

  it('readFloor(path) names the path in validation errors', async () => {
    const path = join(dir, 'bad.json');
    await writeFile(path, floorText.replace('"surface":"concrete"', '"surface":"marble"'));
    expect(await messageOf(readFloor(path))).toBe(
      `${path}: cell "Q2" (cells[1]) "surface" must be one of the surfaces (rubber, concrete), got "marble"`,
    );
  });
});
