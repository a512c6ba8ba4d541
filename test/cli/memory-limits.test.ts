import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { BIN, tempDir } from '../helpers/run-cli.js';

// Inputs a few kilobytes long that once asked for gigabytes (a runs table whose steps jump by 10⁷, a
// header of 10⁶ columns), and the commands under an address-space limit (`ulimit -v`), where V8 cannot
// set aside the ~10 GB it reserves per WebAssembly memory. Peak memory is the child's own figure
// (process.resourceUsage().maxRSS, VmPeak from /proc/self/status), written at exit by a preloaded script.
// The demo building and its runs are invented (datasets/quillmoor).

const demo = (name: string): string => fileURLToPath(new URL(`../../datasets/quillmoor/${name}`, import.meta.url));
const FLOOR = demo('floor.json');
const RUNS = demo('runs.csv');
const tmp = tempDir();
const p = tmp.path;

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
  /** Peak resident memory and peak address space of the child, in KB. */
  maxRssKb: number;
  vmPeakKb: number;
}

/** Runs the built command, under `ulimit -v limitKb` when given, and reads its peaks. */
function run(args: string[], limitKb?: number): Run {
  const peaks = p(`peaks-${Math.random().toString(36).slice(2)}.json`);
  const script = `${limitKb ? `ulimit -v ${limitKb}; ` : ''}exec "$@"`;
  const r = spawnSync('bash', ['-c', script, 'bash', process.execPath, BIN, ...args], {
    encoding: 'utf8',
    env: { ...process.env, FORCE_COLOR: '0', NODE_OPTIONS: `--require ${p('peaks.cjs')}`, UNDERFOOT_TEST_PEAKS: peaks },
  });
  let figures = { maxRssKb: NaN, vmPeakKb: NaN };
  try {
    figures = JSON.parse(readFileSync(peaks, 'utf8'));
  } catch {
    // no figures: the process died before its exit handlers ran
  }
  return { code: r.status, stdout: r.stdout, stderr: r.stderr, ...figures };
}

/** stderr is exactly one line (and no stack trace). */
function expectOneLine(stderr: string, pattern: RegExp): void {
  const lines = stderr.split('\n').filter((l) => l !== '');
  expect(lines, stderr).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(stderr).not.toMatch(/^\s+at /m);
}

beforeAll(() => {
  writeFileSync(
    p('peaks.cjs'),
    `const { isMainThread } = require('node:worker_threads');
if (isMainThread && process.env.UNDERFOOT_TEST_PEAKS) process.on('exit', () => {
  const status = require('node:fs').readFileSync('/proc/self/status', 'utf8');
  const vmPeakKb = Number((/VmPeak:\\s*(\\d+)/.exec(status) || [])[1]);
  require('node:fs').writeFileSync(process.env.UNDERFOOT_TEST_PEAKS, JSON.stringify({ maxRssKb: process.resourceUsage().maxRSS, vmPeakKb }));
});
`,
  );
  // 200 runs of two rows, steps 0 and 10⁷: about 6 KB that name 2 · 10⁹ steps.
  const lines = ['run,step,reading'];
  for (let r = 0; r < 200; r++) lines.push(`r${r},0,oak`, `r${r},10000000,tile`);
  writeFileSync(p('gaps.csv'), `${lines.join('\n')}\n`);
  // A header of 10⁶ columns (about 8 MB) and one short row.
  writeFileSync(p('wide.csv'), `${Array.from({ length: 1_000_000 }, (_, j) => `c${j}`).join(',')}\nx\n`);
});
afterAll(() => tmp.remove());

const MB = 1024;

describe('memory bounded by the input', () => {
  it('a 6 KB runs table whose steps jump by 10⁷: check, fit and decode refuse it in one line, in little memory, leaving it unchanged', () => {
    const before = readFileSync(p('gaps.csv'));
    expect(before.length).toBeLessThan(7000);
    const commands = [
      ['check', '--floor', FLOOR, '--runs', p('gaps.csv')],
      ['fit', '--floor', FLOOR, '--runs', p('gaps.csv'), '--out', p('gaps-model.json'), '--workers', '1'],
      ['decode', '--model', demo('truth-model.json'), '--runs', p('gaps.csv'), '--out', p('gaps-annotated.csv')],
    ];
    for (const args of commands) {
      const r = run(args);
      expect(r.code, `${args[0]}: ${r.stderr}`).toBe(2);
      expectOneLine(r.stderr, /^underfoot: .*gaps\.csv: runs must span at most 1400000 steps in all \(1000 per row \+ 1000000, at most 100000000; gaps count\), got 10000001 by run "r0" \(steps 0 to 10000000 in 2 rows; is the step column a sample index\?\)$/);
      expect(r.maxRssKb, args[0]).toBeLessThan(500 * MB);
    }
    expect(readFileSync(p('gaps.csv')).equals(before)).toBe(true);
  });

  it('a header of 10⁶ columns: one line, exit 2, in little memory', () => {
    const r = run(['check', '--floor', FLOOR, '--runs', p('wide.csv')]);
    expect(r.code, r.stderr).toBe(2);
    expectOneLine(r.stderr, /^underfoot: .*wide\.csv: header must name at most 10000 columns, got more \(field 10001 on line 1\)$/);
    expect(r.maxRssKb).toBeLessThan(500 * MB);
  });
});

describe('under an address-space limit (ulimit -v 4000000)', () => {
  const fitArgs = (out: string, workers: number): string[] => ['fit', '--floor', FLOOR, '--runs', RUNS, '--out', out, '--restarts', '1', '--max-iter', '4', '--workers', String(workers), '--quiet'];

  it('fit and decode of the demo succeed with 1 and 2 threads and write the bytes of an unlimited run', () => {
    const free = run(fitArgs(p('free.json'), 1));
    expect(free.code, free.stderr).toBe(0);
    const freeDecode = run(['decode', '--model', p('free.json'), '--runs', RUNS, '--out', p('free.csv')]);
    expect(freeDecode.code, freeDecode.stderr).toBe(0);
    for (const workers of [1, 2]) {
      const limited = run(fitArgs(p(`limited-${workers}.json`), workers), 4_000_000);
      expect(limited.code, limited.stderr).toBe(0);
      // At most the warning that the JavaScript kernels ran instead of WebAssembly: no stack, no error.
      for (const line of limited.stderr.split('\n').filter((l) => l !== '')) expect(line).toMatch(/^warning: WebAssembly memory could not be had/);
      expect(readFileSync(p(`limited-${workers}.json`)).equals(readFileSync(p('free.json'))), `--workers ${workers}`).toBe(true);
    }
    const decode = run(['decode', '--model', p('free.json'), '--runs', RUNS, '--out', p('limited.csv')], 4_000_000);
    expect(decode.code, decode.stderr).toBe(0);
    expect(readFileSync(p('limited.csv')).equals(readFileSync(p('free.csv')))).toBe(true);
  });

  it('when memory truly runs out, one line and exit 1, no stack trace', () => {
    // The address space a small fit needs, plus 48 MB: too little for a run spanning 10⁶ steps, whose
    // forward table alone takes 128 MB (the workspace limit).
    writeFileSync(p('short.csv'), 'run,step,reading\nr,0,oak\nr,99,tile\n');
    writeFileSync(p('long.csv'), 'run,step,reading\nr,0,oak\nr,999999,tile\n');
    const runFit = (runs: string, limitKb?: number): Run =>
      run(['fit', '--floor', FLOOR, '--runs', runs, '--out', p('oom.json'), '--restarts', '1', '--max-iter', '1', '--holdout', '0', '--workers', '1', '--quiet'], limitKb);
    const small = runFit(p('short.csv'), 4_000_000); // limited too, so no WebAssembly reservation counts
    expect(small.code, small.stderr).toBe(0);
    expect(small.vmPeakKb).toBeGreaterThan(0);
    const r = runFit(p('long.csv'), small.vmPeakKb + 48 * MB);
    expect(r.code, r.stderr).toBe(1);
    expectOneLine(r.stderr, /^underfoot: memory: the work must fit in the memory this process may use, got an allocation refused \(.+\); close other programs, use fewer --workers, or raise the limit \(ulimit -v\)$/);
  });
});
