/**
 * Start-up of `fit` (issue 14: "process start to the first E-step"), split into its parts:
 *
 *     npm run build && node dist/bench/start-up.js [repeats] [workers]
 *
 * On the demo building (datasets/quillmoor: floor.json, runs.csv), each repeat (default 3) runs, each in
 * a fresh Node process:
 *
 * - `node -e ""`: Node's own start, the floor under every figure;
 * - a child that marks, since its process started (`performance.now()`): Node ready (the script's first
 *   line), the command-line modules loaded (`cli/main.js` and `cli/fit-command.js`, which is what
 *   `underfoot fit` loads), the floor and runs read and digested (as `fit` reads them), and the end of
 *   the start of the first E-step (the fit's first call on its E-step engine) and the end of the first EM
 *   iteration (`--restarts 1 --holdout 0 --max-iter 1`, workers as given, default 1);
 * - the real command, `underfoot fit … --restarts 1 --holdout 0 --max-iter 1 --no-final-pass`, whole
 *   process (start, read, one iteration, write the model).
 *
 * Prints every repeat and the best (smallest) of each column. Nothing is written outside a temporary
 * folder, which is removed at the end.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '..', '..');
const FLOOR = path.join(root, 'datasets', 'quillmoor', 'floor.json');
const RUNS = path.join(root, 'datasets', 'quillmoor', 'runs.csv');
const BIN = path.resolve(here, '..', 'src', 'cli', 'bin.js');

interface Marks {
  node: number;
  modules: number;
  read: number;
  firstEStep: number;
  firstIteration: number;
}

/** In a child process: the marks, in seconds since the process started. Only Node's modules are loaded statically. */
async function child(workers: number): Promise<void> {
  const node = performance.now();
  await import('../src/cli/main.js');
  await import('../src/cli/fit-command.js');
  const modules = performance.now();
  const { readFloor } = await import('../src/io/read-floor.js');
  const { loadRuns } = await import('../src/pipeline/load-runs.js');
  const { fileDigest } = await import('../src/io/file-digest.js');
  const { resolveFitOptions } = await import('../src/pipeline/resolve-fit-options.js');
  const { fitModel } = await import('../src/fit/fit-model.js');
  // The first E-step starts when the fit first asks its engine for counts (or scores): marked by wrapping
  // the engines' methods (the same module instances `fitModel` uses).
  let firstEStep = NaN;
  const engines = [(await import('../src/fit/local-engine.js')).LocalEngine, ...(workers > 1 ? [(await import('../src/fit/pool-engine.js')).PoolEngine] : [])];
  for (const engine of engines) {
    for (const name of ['counts', 'score'] as const) {
      const original = engine.prototype[name] as (...args: unknown[]) => unknown;
      (engine.prototype as unknown as Record<string, unknown>)[name] = function (this: unknown, ...args: unknown[]) {
        if (Number.isNaN(firstEStep)) firstEStep = performance.now();
        return original.apply(this, args);
      };
    }
  }
  const floor = await readFloor(FLOOR);
  const loaded = await loadRuns([RUNS], { surfaces: floor.surfaces });
  const floorDigest = await fileDigest(FLOOR);
  const read = performance.now();
  const { options } = resolveFitOptions({ restarts: 1, holdout: 0, maxIter: 1, finalPass: false, workers }, 'start-up');
  const ends: number[] = [];
  await fitModel(
    { floor, runs: loaded.runs, floorDigest, runsDigests: loaded.digests, movement: loaded.movement !== null },
    options,
    workers,
    () => ends.push(performance.now()),
  );
  const marks: Marks = { node, modules, read, firstEStep, firstIteration: ends[0] };
  process.stdout.write(`${JSON.stringify(Object.fromEntries(Object.entries(marks).map(([k, v]) => [k, v / 1000])))}\n`);
}

function wall(args: string[]): number {
  const t0 = process.hrtime.bigint();
  const res = spawnSync(process.execPath, args, { encoding: 'utf8', maxBuffer: 1 << 20 });
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  if (res.status !== 0) throw new Error(`start-up: ${args.join(' ')} failed: ${res.stderr.trim().split('\n').slice(-3).join(' / ')}`);
  return seconds;
}

if (process.argv[2] === '--child') {
  await child(Number(process.argv[3]));
} else {
  const repeats = Number(process.argv[2] ?? 3);
  const workers = Number(process.argv[3] ?? 1);
  if (!(Number.isInteger(repeats) && repeats > 0 && Number.isInteger(workers) && workers > 0)) {
    process.stderr.write(`start-up: usage: node dist/bench/start-up.js [repeats ≥ 1] [workers ≥ 1], got ${process.argv.slice(2).join(' ')}\n`);
    process.exit(2);
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-start-up-'));
  try {
    console.log(
      `fit start-up on the demo (${path.relative(root, RUNS)}), --workers ${workers}; Node ${process.version}, ${os.availableParallelism()} cores, ` +
        `load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`,
    );
    console.log('seconds since process start:');
    console.log('repeat   node -e ""   Node ready   modules   floor+runs read   1st E-step starts   1st EM iteration ends   underfoot fit (whole)');
    const self = fileURLToPath(import.meta.url);
    const rows: number[][] = [];
    for (let k = 0; k < repeats; k++) {
      const bare = wall(['-e', '']);
      const res = spawnSync(process.execPath, [self, '--child', String(workers)], { encoding: 'utf8', maxBuffer: 1 << 20 });
      if (res.status !== 0) throw new Error(`start-up: the child failed: ${res.stderr.trim().split('\n').slice(-3).join(' / ')}`);
      const m = JSON.parse(res.stdout.trim().split('\n').pop()!) as Marks;
      const whole = wall([
        BIN, 'fit', '--floor', FLOOR, '--runs', RUNS, '--out', path.join(dir, `model-${k}.json`),
        '--restarts', '1', '--holdout', '0', '--max-iter', '1', '--no-final-pass', '--workers', String(workers), '--quiet',
      ]);
      const row = [bare, m.node, m.modules, m.read, m.firstEStep, m.firstIteration, whole];
      rows.push(row);
      console.log(`${String(k + 1).padStart(6)} ${row.map((x, j) => x.toFixed(3).padStart([12, 12, 9, 17, 19, 23, 23][j])).join(' ')}`);
    }
    const best = rows[0].map((_, j) => Math.min(...rows.map((r) => r[j])));
    console.log(`  best ${best.map((x, j) => x.toFixed(3).padStart([12, 12, 9, 17, 19, 23, 23][j])).join(' ')}`);
    const split = rows.map(([, n, mo, rd, st]) => [n, mo - n, rd - mo, st - rd, st]);
    const bestSplit = split[0].map((_, j) => Math.min(...split.map((r) => r[j])));
    console.log(
      `split, best of ${repeats} for each part: Node ${bestSplit[0].toFixed(3)} s, module loading ${bestSplit[1].toFixed(3)} s, ` +
        `floor+runs read ${bestSplit[2].toFixed(3)} s, preparing the fit ${bestSplit[3].toFixed(3)} s; process start → first E-step ${bestSplit[4].toFixed(3)} s`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
