import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { chmodSync, linkSync, mkdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { planOutputs, type NamedPath } from '../../src/io/plan-outputs.js';
import { InputError } from '../../src/errors.js';
import { tempDir } from '../helpers/run-cli.js';

const tmp = tempDir('underfoot-plan-');
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('runs.csv'), 'run,step,reading\n');
  writeFileSync(p('floor.json'), '{}');
  mkdirSync(p('sub'));
  linkSync(p('runs.csv'), p('sub/hard.csv'));
  symlinkSync(p('floor.json'), p('sub/link.json'));
  symlinkSync(p('nowhere.json'), p('dangling.json'));
  writeFileSync(p('old-result.csv'), 'previous\n');
  mkdirSync(p('locked'));
  spawnSync('mkfifo', [p('fifo.csv')]);
});
afterAll(() => {
  chmodSync(p('locked'), 0o755);
  tmp.remove();
});

const inputs: NamedPath[] = [
  { path: p('runs.csv'), what: '--runs' },
  { path: p('floor.json'), what: '--floor' },
  { path: p('missing.json'), what: '--model' }, // missing inputs are left to their reader
];

async function messageOf(outputs: NamedPath[]): Promise<string | null> {
  try {
    await planOutputs('cmd', inputs, outputs);
    return null;
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
}

describe('planOutputs(where, inputs, outputs)', () => {
  it('accepts new paths, new folders and existing regular files that are not inputs', async () => {
    expect(await messageOf([{ path: p('new.csv'), what: '--out' }, { path: p('deep/er/s.csv'), what: '--summary' }, { path: p('old-result.csv'), what: '--x' }])).toBeNull();
    expect(await messageOf([{ path: null, what: '--summary' }, { path: '', what: '--out' }])).toBeNull();
  });

  it('refuses an output naming an input: the same path, through "..", through a symlink, or a hard link', async () => {
    expect(await messageOf([{ path: p('runs.csv'), what: '--out' }])).toBe(`cmd: --out must not name an input, got ${p('runs.csv')}, the same file as --runs ${p('runs.csv')}`);
    expect(await messageOf([{ path: join(p('sub'), '..', 'floor.json'), what: '--out' }])).toContain('the same file as --floor');
    expect(await messageOf([{ path: p('sub/link.json'), what: '--out' }])).toContain('the same file as --floor');
    expect(await messageOf([{ path: p('sub/hard.csv'), what: '--out' }])).toContain('the same file as --runs');
  });

  it('refuses two outputs that are the same file, also when one is new and spelt differently', async () => {
    expect(await messageOf([{ path: p('a.csv'), what: '--out' }, { path: join(p('sub'), '..', 'a.csv'), what: '--summary' }])).toBe(
      `cmd: --summary must differ from every other output, got ${join(p('sub'), '..', 'a.csv')}, the same file as --out ${p('a.csv')}`,
    );
    expect(await messageOf([{ path: p('old-result.csv'), what: '--out' }, { path: p('old-result.csv'), what: '--summary' }])).toContain('must differ from every other output');
  });

  it('refuses devices, folders, FIFOs, dangling symlinks and paths through a file', async () => {
    expect(await messageOf([{ path: '/dev/null', what: '--out' }])).toBe('cmd: --out must be a regular file or a new file path, got /dev/null, a character device');
    expect(await messageOf([{ path: p('sub'), what: '--out' }])).toContain('a folder');
    expect(await messageOf([{ path: p('fifo.csv'), what: '--out' }])).toContain('a FIFO (named pipe)');
    expect(await messageOf([{ path: p('dangling.json'), what: '--out' }])).toContain('a symbolic link to nothing');
    expect(await messageOf([{ path: p('runs.csv/x.csv'), what: '--out' }])).toContain('which is not a folder');
  });

  it('refuses an output in a folder it cannot write (unless running as root, which may)', async () => {
    chmodSync(p('locked'), 0o555);
    const message = await messageOf([{ path: p('locked/out.csv'), what: '--out' }]);
    if (process.getuid?.() === 0) expect(message).toBeNull();
    else expect(message).toContain('--out must lie in a writable folder');
  });
});
