import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { BIN, runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

const floor = gridFloor(4, 4, ['oak', 'carpet', 'tile'], (x, y) => (x * 2 + y) % 3, 'atomic test floor');
const tmp = tempDir();
const p = tmp.path;
const ROWS = 400 * 500;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  expect(runCli(['simulate', '--floor', p('floor.json'), '--runs', '400', '--steps', '500', '--seed', '9', '--out', p('runs.csv')]).code).toBe(0);
  expect(runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet']).code).toBe(0);
});
afterAll(() => tmp.remove());

describe('atomic outputs', () => {
  it('SIGKILL while the annotated table is being written leaves the old file, never a truncated one', async () => {
    const out = p('annotated.csv');
    writeFileSync(out, 'the previous result\n');
    const child = spawn(process.execPath, [BIN, 'decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', out], { stdio: 'ignore' });
    // Kill as soon as the temporary file appears, i.e. in the middle of writing.
    const killedWhileWriting = await new Promise<boolean>((resolve) => {
      const poll = setInterval(() => {
        if (readdirSync(tmp.dir).some((f) => f.startsWith('annotated.csv.tmp-'))) {
          clearInterval(poll);
          child.kill('SIGKILL');
          resolve(true);
        }
      }, 1);
      child.on('exit', () => {
        clearInterval(poll);
        resolve(false);
      });
    });
    await new Promise((r) => (child.exitCode !== null || child.signalCode !== null ? r(null) : child.on('exit', r)));
    const text = readFileSync(out, 'utf8');
    if (killedWhileWriting) expect(text).toBe('the previous result\n');
    else expect(text.trimEnd().split('\n')).toHaveLength(ROWS + 1); // finished before the kill: complete
    expect(killedWhileWriting).toBe(true);
  });

  it('running the command again replaces the old file with the complete table and clears the killed run\'s temporary file', () => {
    const out = p('annotated.csv');
    expect(readdirSync(tmp.dir).filter((f) => f.includes('.tmp-')).length).toBe(1); // left by the SIGKILL above
    expect(runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', out]).code).toBe(0);
    expect(readFileSync(out, 'utf8').trimEnd().split('\n')).toHaveLength(ROWS + 1);
    expect(readdirSync(tmp.dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
  });
});
