/**
 * Cost of the E-step with odometry (per-step transitions) against the plain E-step, on the medium
 * scenario (a 20 × 20 building), as the fit runs it — `accumulateBlock` over blocks of 8 runs:
 *
 *     npm run build && node dist/bench/movement-split.js [runs] [repeats]
 *
 * Rows: plain E-step with the WebAssembly lanes, with the JavaScript lanes and one run at a time, and
 * the E-step with movement columns (distance known at every step, heading at every move) with the
 * WebAssembly movement lanes, the JavaScript movement lanes and one run at a time. Printed: median
 * and fastest pass in ns per step-link (total steps × transition nonzeros), and the movement cost
 * relative to each plain one — first movement WebAssembly / plain WebAssembly, the target.
 */
import { makeScenario } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { accumulateBlock } from '../src/fit/accumulate-block.js';
import { EStepWorkspace } from '../src/fit/e-step-workspace.js';
import { packRuns } from '../src/fit/packed-runs.js';
import { toBlocks } from '../src/fit/to-blocks.js';
import { sampleOdometry } from '../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../src/model/move-steps-from-odometry.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { DEFAULT_MOVEMENT } from '../src/model/default-movement.js';

const nRuns = Number(process.argv[2] ?? 24);
const repeats = Number(process.argv[3] ?? 5);
const sc = makeScenario('medium', 1);
const runs = sc.runs.slice(0, nRuns);
const rng = new SeededRandom(7);
const withMoves = runs.map((r, k) => {
  const od = sampleOdometry(sc.truth, sc.truePaths[k], rng);
  return { ...r, moves: moveStepsFromOdometry(od.moved, od.heading) };
});
const plainPacked = packRuns(runs);
const movePacked = packRuns(withMoves);
const plainChain = chainFromModel(sc.truth);
const moveChain = chainFromModel({ ...sc.truth, movement: DEFAULT_MOVEMENT });
const blocks = toBlocks(Array.from({ length: runs.length }, (_, r) => r), 8);
const stepLinks = runs.reduce((s, r) => s + r.obs.length, 0) * plainChain.nnz;

function time(label: string, f: () => void): number {
  const ns: number[] = [];
  f();
  for (let k = 0; k < repeats; k++) {
    const t0 = process.hrtime.bigint();
    f();
    ns.push(Number(process.hrtime.bigint() - t0) / stepLinks);
  }
  ns.sort((a, b) => a - b);
  const median = ns[Math.floor(ns.length / 2)];
  process.stdout.write(`${label.padEnd(44)} ${median.toFixed(3).padStart(8)} ns/step-link (fastest ${ns[0].toFixed(3)})\n`);
  return median;
}

process.stdout.write(`medium scenario: ${runs.length} runs × ${runs[0].obs.length} steps, ${plainChain.nnz} nonzeros, ${repeats} passes\n`);
const wsWasm = new EStepWorkspace();
const wsJs = new EStepWorkspace();
wsJs.useWasm = false;
const wsMove = new EStepWorkspace();
const wasm = time('plain E-step, WebAssembly lanes (tied)', () => blocks.forEach((b) => accumulateBlock(plainChain, plainPacked, b, wsWasm, 'tied')));
const js = time('plain E-step, JavaScript lanes (tied)', () => blocks.forEach((b) => accumulateBlock(plainChain, plainPacked, b, wsJs, 'tied')));
const single = time('plain E-step, one run at a time (JavaScript)', () => {
  // accumulateBlock sends a lone run through the single-run kernels: blocks of one run.
  for (let r = 0; r < runs.length; r++) accumulateBlock(plainChain, plainPacked, [r], wsJs, 'tied');
});
const wsMoveJs = new EStepWorkspace();
wsMoveJs.useWasm = false;
const moveWasm = time('movement E-step, WebAssembly lanes (tied)', () => blocks.forEach((b) => accumulateBlock(moveChain, movePacked, b, wsMove, 'tied')));
const move = time('movement E-step, JavaScript lanes (tied)', () => blocks.forEach((b) => accumulateBlock(moveChain, movePacked, b, wsMoveJs, 'tied')));
const moveSingle = time('movement E-step, one run at a time (JavaScript)', () => {
  for (let r = 0; r < runs.length; r++) accumulateBlock(moveChain, movePacked, [r], wsMoveJs, 'tied');
});
process.stdout.write(`movement WebAssembly lanes / plain WebAssembly lanes: ${(moveWasm / wasm).toFixed(2)}× (target ≤ 1.5×); movement / plain JavaScript lanes: ${(move / js).toFixed(2)}×\n`);
process.stdout.write(`movement JavaScript lanes / plain WebAssembly lanes: ${(move / wasm).toFixed(2)}×; / plain JavaScript lanes: ${(move / js).toFixed(2)}×\n`);
process.stdout.write(`movement one run at a time / plain one run at a time: ${(moveSingle / single).toFixed(2)}×\n`);
