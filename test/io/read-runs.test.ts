import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Int32, Table, tableToIPC, Utf8, vectorFromArray } from 'apache-arrow';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { readRuns } from '../../src/io/read-runs.js';
import { DROPOUT } from '../../src/io/runs-table.js';

// Source: the file formats (docs/formats.md), "Runs table": format chosen by extension, `.csv`, `.arrow` /
// `.feather` (IPC file), `.arrows` (IPC stream). Runs are invented.

const OPTIONS = { surfaces: ['rubber', 'concrete'] };
let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'underfoot-read-runs-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function inputErrorOf(promise: Promise<unknown>): Promise<string> {
  const error = await promise.then(
    () => undefined,
    (err: unknown) => err,
  );
  expect(error).toBeInstanceOf(InputError);
  expect((error as Error).message).not.toMatch(/[\r\n]/);
  return (error as Error).message;
}

function arrowTable(): Table {
  return new Table({
    run: vectorFromArray(['m1', 'm1', 'm1'], new Utf8()),
    step: vectorFromArray([0, 2, 1], new Int32()),
    reading: vectorFromArray(['rubber', 'concrete', null], new Utf8()),
  });
}

describe('readRuns(path, options)', () => {
  it('readRuns(path.csv) reads CSV, also with an upper-case extension', async () => {
    for (const name of ['runs.csv', 'RUNS.CSV']) {
      const path = join(dir, name);
      await writeFile(path, '\ufeffrun,step,reading\r\nm1,0,rubber\r\nm1,2,concrete\r\n');
      const table = await readRuns(path, OPTIONS);
      expect(table.source).toBe(path);
      expect([...table.runs[0].obs]).toEqual([0, DROPOUT, 1]);
    }
  });

  it('readRuns(path.arrow / .feather / .arrows) reads Arrow IPC files and streams', async () => {
    const cases: Array<[string, 'file' | 'stream']> = [
      ['runs.arrow', 'file'],
      ['runs.feather', 'file'],
      ['runs.arrows', 'stream'],
    ];
    for (const [name, format] of cases) {
      const path = join(dir, name);
      await writeFile(path, tableToIPC(arrowTable(), format));
      const table = await readRuns(path, OPTIONS);
      expect([...table.runs[0].obs]).toEqual([0, DROPOUT, 1]);
      expect(table.runs[0].nDropouts).toBe(1);
    }
  });

  it('readRuns(path) rejects an unsupported extension, listing the supported ones', async () => {
    const path = join(dir, 'runs.xlsx');
    expect(await inputErrorOf(readRuns(path, OPTIONS))).toBe(
      `${path}: extension must be one of .csv, .arrow, .feather, .arrows, .parquet, got ".xlsx"`,
    );
    const bare = join(dir, 'runs');
    expect(await inputErrorOf(readRuns(bare, OPTIONS))).toBe(
      `${bare}: extension must be one of .csv, .arrow, .feather, .arrows, .parquet, got none`,
    );
  });

  it('readRuns(path) rejects a missing file with one line', async () => {
    const path = join(dir, 'missing.csv');
    expect(await inputErrorOf(readRuns(path, OPTIONS))).toBe(`${path}: file must exist, got no such file`);
  });

  it('readRuns(path) names the path in table errors', async () => {
    const path = join(dir, 'bad.csv');
    await writeFile(path, 'run,step,reading\nm1,0,gravel\n');
    expect(await inputErrorOf(readRuns(path, OPTIONS))).toBe(
      `${path}: reading at run "m1" step 0 must be one of the floor's surfaces (rubber, concrete), got "gravel"`,
    );
  });
});
