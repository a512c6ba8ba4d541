/**
 * The two reference libraries the benchmark compares with, run as child processes on the same model
 * and runs as underfoot (see README.md, "Peers"):
 *
 * - GHMM (Debian `libghmm-dev`), through `test/bench/peers/ghmm-driver.c`, compiled here with gcc into
 *   a temporary directory when the library's headers are installed;
 * - pomegranate 0.14 (Debian `python3-pomegranate`), through `test/bench/peers/pomegranate-driver.py`,
 *   run with `/usr/bin/python3` when that interpreter can import it.
 *
 * Both read the model and runs as text on stdin and time only their library calls. Neither knows
 * dropouts, so a dropout is passed as an extra symbol whose emission probability is 1 in every state —
 * exactly what a dropout means — which keeps their log-likelihood equal to underfoot's. Both are run
 * with the allocator settings of DEVELOPERS.md, "Reference libraries and peers" (without them their
 * per-step temporary allocations churn page faults and they run 2–4× slower than they can) and one
 * BLAS thread.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { HmmModel } from '../src/model/hmm-model.js';

export type PeerName = 'ghmm' | 'pomegranate';

/** What a peer reported, or why it did not run. */
export type PeerResult =
  | {
      ran: true;
      scoreSeconds: number;
      logLik: number;
      viterbiSeconds: number;
      pathLogProb: number;
      /** Each timed Baum-Welch call: its iteration count and seconds. */
      baumWelch: Array<{ iterations: number; seconds: number }>;
      /**
       * Seconds per Baum-Welch iteration: with two calls, the difference of their times over the
       * difference of their counts (which cancels GHMM's extra forward pass per call); with one, its
       * time over its count; NaN with none.
       */
      secondsPerIteration: number;
      rssMB: number;
    }
  | { ran: false; reason: string };

const PEER_ENV = {
  MALLOC_MMAP_THRESHOLD_: '33554432',
  MALLOC_TRIM_THRESHOLD_: '4294967296',
  OPENBLAS_NUM_THREADS: '1',
  OMP_NUM_THREADS: '1',
};

/** The repository's `test/bench/peers/` folder (this file runs from `dist/bench/`, or from `bench/` under tsx). */
function peersDir(): string {
  const here = path.dirname(fileURLToPath(import.meta.url));
  for (const up of ['..', path.join('..', '..')]) {
    const dir = path.resolve(here, up, 'test', 'bench', 'peers');
    if (existsSync(dir)) return dir;
  }
  throw new Error('peers: test/bench/peers must exist next to the bench, got nothing there');
}

/** The peers' input text: model, runs (dropout = the extra last symbol) and the Baum-Welch calls to time. */
export function peerInput(model: HmmModel, runs: ReadonlyArray<Int32Array>, calls: ReadonlyArray<number>): string {
  const s = model.structure;
  const n = s.nCells;
  const m = model.surfaces.length;
  const parts: string[] = [`${n} ${m + 1}`, Array.from(model.start, String).join(' ')];
  for (let i = 0; i < n; i++) {
    const row = [String(s.succPtr[i + 1] - s.succPtr[i])];
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) row.push(String(s.succIdx[k]), String(model.trans[k]));
    parts.push(row.join(' '));
  }
  for (let i = 0; i < n; i++) parts.push([...Array.from(model.emission.subarray(i * m, (i + 1) * m), String), '1'].join(' '));
  parts.push(String(runs.length));
  for (const obs of runs) parts.push(`${obs.length} ${Array.from(obs, (o) => (o < 0 ? m : o)).join(' ')}`);
  parts.push([calls.length, ...calls].join(' '));
  return `${parts.join('\n')}\n`;
}

/** Compiles the GHMM driver; returns the executable's path, or why it cannot be built. */
function buildGhmm(dir: string): { exe: string } | { reason: string } {
  if (!existsSync('/usr/include/ghmm/model.h')) return { reason: 'not installed (apt-get install libghmm-dev)' };
  const exe = path.join(dir, 'ghmm-driver');
  const cc = spawnSync('gcc', ['-O2', '-o', exe, path.join(peersDir(), 'ghmm-driver.c'), '-lghmm', '-lm'], { encoding: 'utf8' });
  if (cc.error) return { reason: `gcc not available (${cc.error.message})` };
  if (cc.status !== 0) return { reason: `gcc failed: ${cc.stderr.trim().split('\n')[0]}` };
  return { exe };
}

function hasPomegranate(): boolean {
  const probe = spawnSync('/usr/bin/python3', ['-c', 'import pomegranate'], { encoding: 'utf8' });
  return !probe.error && probe.status === 0;
}

function parseOutput(text: string): PeerResult {
  const lines = text.trim().split('\n').map((l) => ({ key: l.split(' ')[0], values: l.split(' ').slice(1).map(Number) }));
  const get = (key: string): number[] | undefined => lines.find((l) => l.key === key)?.values;
  const score = get('score');
  const viterbi = get('viterbi');
  const rss = get('rss-kb');
  if (!score || !viterbi || !rss) return { ran: false, reason: `unexpected output: ${JSON.stringify(text.slice(0, 200))}` };
  const baumWelch = lines.filter((l) => l.key === 'baum-welch').map((l) => ({ iterations: l.values[0], seconds: l.values[1] }));
  const first = baumWelch[0];
  const last = baumWelch[baumWelch.length - 1];
  const secondsPerIteration =
    baumWelch.length === 0
      ? NaN
      : baumWelch.length === 1 || last.iterations === first.iterations
        ? first.seconds / first.iterations
        : (last.seconds - first.seconds) / (last.iterations - first.iterations);
  return {
    ran: true,
    scoreSeconds: score[0],
    logLik: score[1],
    viterbiSeconds: viterbi[0],
    pathLogProb: viterbi[1],
    baumWelch,
    secondsPerIteration,
    rssMB: rss[0] / 1024,
  };
}

/**
 * Runs one peer on `input` (from `peerInput`). A peer that is not installed, or fails, comes back with
 * `ran: false` and the reason, to be printed as skipped.
 */
export function runPeer(name: PeerName, input: string): PeerResult {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-peers-'));
  try {
    let command: string;
    let args: string[];
    if (name === 'ghmm') {
      const built = buildGhmm(dir);
      if ('reason' in built) return { ran: false, reason: built.reason };
      command = built.exe;
      args = [];
    } else {
      if (!hasPomegranate()) return { ran: false, reason: 'not installed (apt-get install python3-pomegranate)' };
      command = '/usr/bin/python3';
      args = [path.join(peersDir(), 'pomegranate-driver.py')];
    }
    const run = spawnSync(command, args, {
      input,
      encoding: 'utf8',
      env: { ...process.env, ...PEER_ENV },
      maxBuffer: 1 << 20,
    });
    if (run.error) return { ran: false, reason: `could not start: ${run.error.message}` };
    if (run.status !== 0) return { ran: false, reason: `failed (exit ${run.status}): ${run.stderr.trim().split('\n').slice(-1)[0] ?? ''}` };
    return parseOutput(run.stdout);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
