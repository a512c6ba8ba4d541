import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { BIN, runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

const floor = gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x + y) % 3, 'resume test floor');
const tmp = tempDir();
const p = tmp.path;
const fitArgs = (out: string, extra: string[] = []) => [
  'fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', out,
  '--restarts', '3', '--max-iter', '120', '--tol', '0', '--workers', '1', '--quiet', ...extra,
];

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  const r = runCli(['simulate', '--floor', p('floor.json'), '--runs', '40', '--steps', '400', '--seed', '4', '--hit', '0.8', '--out', p('runs.csv')]);
  expect(r.code, r.stderr).toBe(0);
  const ref = runCli(fitArgs(p('reference.json')));
  expect(ref.code, ref.stderr).toBe(0);
});
afterAll(() => tmp.remove());

/** Starts the fit, waits until its checkpoint shows progress, then sends `signal`; resolves with the exit. */
function interruptFit(out: string, dir: string, signal: NodeJS.Signals): Promise<{ code: number | null; signal: NodeJS.Signals | null; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, ...fitArgs(out, ['--checkpoint', dir])], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    const started = Date.now();
    const poll = setInterval(() => {
      const file = `${dir}/fit-checkpoint.json`;
      let ready = false;
      try {
        const cp = JSON.parse(readFileSync(file, 'utf8'));
        ready = cp.done.length >= 1 && cp.current !== null && cp.current.iterations >= 5;
      } catch {
        /* not there yet, or being replaced */
      }
      if (ready) {
        clearInterval(poll);
        child.kill(signal);
      } else if (Date.now() - started > 60_000) {
        clearInterval(poll);
        child.kill('SIGKILL');
        reject(new Error('the fit finished or stalled before it could be interrupted'));
      }
    }, 10);
    child.on('exit', (code, sig) => {
      clearInterval(poll);
      resolve({ code, signal: sig, stderr });
    });
  });
}

describe('fit --checkpoint', () => {
  it('after SIGKILL, the same command resumes and writes the byte-identical model', async () => {
    const dir = p('cp-kill');
    const killed = await interruptFit(p('killed.json'), dir, 'SIGKILL');
    expect(killed.signal).toBe('SIGKILL');
    expect(existsSync(p('killed.json'))).toBe(false);
    const resumed = runCli(fitArgs(p('killed.json'), ['--checkpoint', dir]));
    expect(resumed.code, resumed.stderr).toBe(0);
    expect(readFileSync(p('killed.json'), 'utf8')).toBe(readFileSync(p('reference.json'), 'utf8'));
    expect(existsSync(`${dir}/fit-checkpoint.json`)).toBe(false); // cleared once the model is written
  });

  it('SIGINT stops cleanly with a message saying how to resume, and the resumed model is byte-identical', async () => {
    const dir = p('cp-int');
    const stopped = await interruptFit(p('interrupted.json'), dir, 'SIGINT');
    expect(stopped.code).toBe(130);
    expect(stopped.stderr).toContain('run the same command again to resume');
    expect(stopped.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(existsSync(`${dir}/fit-checkpoint.json`)).toBe(true);
    const resumed = runCli(fitArgs(p('interrupted.json'), ['--checkpoint', dir]));
    expect(resumed.code, resumed.stderr).toBe(0);
    expect(readFileSync(p('interrupted.json'), 'utf8')).toBe(readFileSync(p('reference.json'), 'utf8'));
  });

  it('a checkpoint from a different fit is refused with one line, exit 2', async () => {
    const dir = p('cp-other');
    await interruptFit(p('other.json'), dir, 'SIGKILL');
    const r = runCli(fitArgs(p('other.json'), ['--checkpoint', dir, '--seed', '7']));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('same fit');
  });
});
