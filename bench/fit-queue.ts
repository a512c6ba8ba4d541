/**
 * `underfoot fit --queue` with two worker processes against `fit --workers 2` in one process, on a
 * scenario building, and what the queue costs in Redis commands and bytes per E-step pass:
 *
 *     npm run build && node dist/bench/fit-queue.js [size] [repeats] [iterations]
 *
 * Starts a private redis-server (loopback, a free port, a temporary folder), writes the scenario's floor
 * (default medium), simulates its runs, then runs `fit --transitions tied --restarts 1 --holdout 0
 * --no-final-pass --max-iter N --tol 0` (N + 1 E-step passes) `repeats` times (default 2) in process
 * with `--workers 2` and over the queue with two `underfoot worker` processes (one block at a time
 * each), alternating. Redis's own counters (INFO stats: commands processed, bytes in and out) are read
 * before and after each queue fit. Prints every timing, the medians and the per-pass figures, and
 * checks that both ways wrote byte-identical models. Stops Redis and removes the folder at the end.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, connect } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeScenario, SCENARIO_SIZES, type ScenarioSize } from './make-scenario.js';

const size = (process.argv[2] ?? 'medium') as ScenarioSize;
const repeats = Number(process.argv[3] ?? 2);
const iterations = Number(process.argv[4] ?? 4);
const bin = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', 'src', 'cli', 'bin.js');
const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-fit-queue-'));
const children: ChildProcess[] = [];

const freePort = (): Promise<number> =>
  new Promise((resolve) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
const accepts = (port: number): Promise<boolean> =>
  new Promise((resolve) => {
    const s = connect(port, '127.0.0.1').once('connect', () => (s.destroy(), resolve(true))).once('error', () => resolve(false));
  });

function run(args: string[]): number {
  const t0 = process.hrtime.bigint();
  const res = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });
  if (res.status !== 0) throw new Error(`underfoot ${args[0]} failed: ${res.stderr.trim()}`);
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

function stats(port: number): { commands: number; inBytes: number; outBytes: number } {
  const text = spawnSync('redis-cli', ['-p', String(port), 'INFO', 'stats'], { encoding: 'utf8' }).stdout;
  const get = (k: string): number => Number(new RegExp(`${k}:(\\d+)`).exec(text)?.[1] ?? NaN);
  return { commands: get('total_commands_processed'), inBytes: get('total_net_input_bytes'), outBytes: get('total_net_output_bytes') };
}

try {
  const port = await freePort();
  const redis = spawn('redis-server', ['--port', String(port), '--bind', '127.0.0.1', '--dir', dir, '--save', '', '--daemonize', 'no'], { stdio: 'ignore' });
  children.push(redis);
  while (!(await accepts(port))) await new Promise((r) => setTimeout(r, 50));
  const url = `redis://127.0.0.1:${port}`;
  const scenario = makeScenario(size, 1);
  const spec = SCENARIO_SIZES[size];
  const floorFile = path.join(dir, 'floor.json');
  const runsFile = path.join(dir, 'runs.arrow');
  writeFileSync(floorFile, JSON.stringify(scenario.floor));
  run(['simulate', '--floor', floorFile, '--runs', String(spec.nRuns), '--steps', String(spec.nSteps), '--dropout-rate', '0.02', '--seed', '1', '--out', runsFile, '-q']);
  const passes = iterations + 1;
  const blocks = Math.ceil(spec.nRuns / 8);
  const common = ['fit', '--floor', floorFile, '--runs', runsFile, '--transitions', 'tied', '--restarts', '1', '--holdout', '0', '--no-final-pass', '--max-iter', String(iterations), '--tol', '0', '-q'];
  for (let w = 0; w < 2; w++) {
    const worker = spawn(process.execPath, [bin, 'worker', '--queue', url, '-q'], { stdio: 'ignore' });
    children.push(worker);
  }
  const local: number[] = [];
  const queued: number[] = [];
  let cost = { commands: 0, inBytes: 0, outBytes: 0 };
  console.log(`${size} building (${scenario.floor.cells.length} cells), ${spec.nRuns} runs × ${spec.nSteps} steps, ${blocks} blocks per pass, ${passes} passes per fit; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  for (let k = 0; k < repeats; k++) {
    local.push(run([...common, '--workers', '2', '--out', path.join(dir, 'local.json')]));
    console.log(`  --workers 2 in process: ${local[k].toFixed(2)} s`);
    const before = stats(port);
    queued.push(run([...common, '--queue', url, '--out', path.join(dir, 'queue.json')]));
    const after = stats(port);
    cost = { commands: after.commands - before.commands, inBytes: after.inBytes - before.inBytes, outBytes: after.outBytes - before.outBytes };
    console.log(`  --queue, 2 worker processes: ${queued[k].toFixed(2)} s; Redis: ${cost.commands} commands, ${(cost.inBytes / 1e6).toFixed(2)} MB in, ${(cost.outBytes / 1e6).toFixed(2)} MB out`);
  }
  const median = (a: number[]): number => a.slice().sort((x, y) => x - y)[a.length >> 1];
  console.log(`median per pass: in process ${(median(local) / passes).toFixed(3)} s, queue ${(median(queued) / passes).toFixed(3)} s (whole command, start-up included; ratio ${(median(queued) / median(local)).toFixed(2)})`);
  console.log(`per pass over the queue (last fit, runs upload spread over the passes): ${(cost.commands / passes).toFixed(0)} commands (${(cost.commands / passes / blocks).toFixed(1)} per block), ${(cost.inBytes / passes / 1e6).toFixed(3)} MB into Redis, ${(cost.outBytes / passes / 1e6).toFixed(3)} MB out of Redis`);
  const same = readFileSync(path.join(dir, 'local.json')).equals(readFileSync(path.join(dir, 'queue.json')));
  console.log(`models in process and over the queue byte-identical: ${same ? 'yes' : 'NO'}`);
  if (!same) process.exitCode = 1;
} finally {
  for (const c of children.reverse()) c.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 500));
  rmSync(dir, { recursive: true, force: true });
}
