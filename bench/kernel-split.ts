/**
 * Times the E-step's kernels separately on the medium scenario (a profiling aid for the kernels):
 *
 *     npm run build && node dist/bench/kernel-split.js [runs] [repeats]
 *
 * Each kernel runs `repeats` times (default 7) over the first `runs` runs (default 40, a multiple of 8);
 * the median and the fastest pass are printed in ns per step-link (total steps × transition nonzeros).
 * The old one-run kernels (CSR/CSC loops, normalise every step) are timed beside the lane kernels, in
 * JavaScript and (where available) WebAssembly SIMD.
 */
import { makeScenario } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { forwardScaled } from '../src/kernels/forward-scaled.js';
import { expectedCounts } from '../src/kernels/expected-counts.js';
import { forwardScore } from '../src/kernels/forward-score.js';
import { forwardSegment } from '../src/kernels/forward-segment.js';
import { backwardCountsSegment } from '../src/kernels/backward-counts-segment.js';
import { forwardLanes } from '../src/kernels/forward-lanes.js';
import { backwardCountsLanes } from '../src/kernels/backward-counts-lanes.js';
import { backwardTotalsLanes } from '../src/kernels/backward-totals-lanes.js';
import { fillLaneGroup } from '../src/kernels/fill-lane-group.js';
import { LANES, type LaneGroup } from '../src/kernels/sparse-chain.js';
import { WasmLaneKernels } from '../src/kernels/wasm-lane-kernels.js';

const nRuns = Number(process.argv[2] ?? 40);
const repeats = Number(process.argv[3] ?? 7);
if (!(Number.isInteger(nRuns) && nRuns > 0 && nRuns % LANES === 0)) {
  process.stderr.write(`kernel-split: runs must be a positive multiple of ${LANES}, got ${JSON.stringify(process.argv[2])}\n`);
  process.exit(2);
}
const sc = makeScenario('medium', 1);
const chain = chainFromModel(sc.truth);
const runs = sc.runs.slice(0, nRuns);
const n = chain.nCells;
const m = chain.nReadings;
const T = runs[0].obs.length;
const nLinks = chain.outPtr[n];
const alpha = new Float64Array(n * T);
const scale = new Float64Array(T * LANES);
const work = new Float64Array(3 * n);
const start = new Float64Array(n);
const trans = new Float64Array(chain.nnz);
const emit = new Float64Array((m + 1) * n);
const table = new Float64Array((T + 1) * n * LANES);
const w = new Float64Array(n * LANES);
const wSpare = new Float64Array(n * LANES);
const links = new Float64Array(nLinks);
const dwell = new Float64Array(n);
const logs = new Float64Array(LANES);
const groups: LaneGroup[] = [];
for (let r = 0; r < runs.length; r += LANES) groups.push(fillLaneGroup(runs.slice(r, r + LANES).map((x) => x.obs), n, m));
const stepLinks = runs.reduce((s, r) => s + r.obs.length, 0) * chain.nnz;

const rows: Array<[string, () => void]> = [
  ['old forwardScore (1 run)', () => { for (const r of runs) forwardScore(chain, r.obs, T, work); }],
  ['old forwardScaled + expectedCounts', () => {
    for (const r of runs) {
      forwardScaled(chain, r.obs, T, alpha, scale);
      expectedCounts(chain, r.obs, T, alpha, scale, work, start, trans, emit);
    }
  }],
  ['forwardSegment (1 run)', () => { for (const r of runs) forwardSegment(chain, r.obs, 0, T, table, scale, 0); }],
  ['forwardSegment + backwardCounts (1 run)', () => {
    for (const r of runs) {
      forwardSegment(chain, r.obs, 0, T, table, scale, 0);
      w.fill(0);
      backwardCountsSegment(chain, r.obs, 0, T, table, scale, w, wSpare, emit, links, dwell, start);
    }
  }],
  ['forwardLanes', () => { for (const g of groups) forwardLanes(chain, g, 0, T, table, scale, logs); }],
  ['forwardLanes + backwardCountsLanes', () => {
    for (const g of groups) {
      forwardLanes(chain, g, 0, T, table, scale, logs);
      w.fill(0);
      backwardCountsLanes(chain, g, 0, T, table, scale, w, wSpare, emit, links, dwell, start);
    }
  }],
  ['forwardLanes + backwardTotalsLanes', () => {
    for (const g of groups) {
      forwardLanes(chain, g, 0, T, table, scale, logs);
      w.fill(0);
      backwardTotalsLanes(chain, g, 0, T, table, scale, w, wSpare, emit, dwell, links, start);
    }
  }],
];
if (WasmLaneKernels.available()) {
  const wasm = WasmLaneKernels.create()!;
  const wasmPass = (perLink: boolean | null) => (): void => {
    for (const g of groups) {
      wasm.prepare(chain, g, T);
      wasm.forward(0, T, logs);
      if (perLink === null) continue;
      wasm.resetBackward();
      wasm.backward(0, T, perLink);
    }
  };
  rows.push(['WebAssembly forwardLanes', wasmPass(null)]);
  rows.push(['WebAssembly forward + backwardCounts', wasmPass(true)]);
  rows.push(['WebAssembly forward + backwardTotals', wasmPass(false)]);
}

const times = new Map<string, number[]>();
for (const [, fn] of rows) fn(); // warm-up
for (let k = 0; k < repeats; k++) {
  for (const [label, fn] of rows) {
    const t0 = process.hrtime.bigint();
    fn();
    const ns = Number(process.hrtime.bigint() - t0);
    times.set(label, [...(times.get(label) ?? []), ns / stepLinks]);
  }
}
const median = (a: number[]): number => a.slice().sort((x, y) => x - y)[a.length >> 1];
console.log(`medium scenario: ${n} cells, ${chain.nnz} nonzeros, ${runs.length} runs × ${T} steps; ${repeats} repeats, ns/step-link`);
console.log(`${'kernels'.padEnd(50)} ${'median'.padStart(7)} ${'fastest'.padStart(7)}`);
for (const [label] of rows) {
  const t = times.get(label)!;
  console.log(`${label.padEnd(50)} ${median(t).toFixed(2).padStart(7)} ${Math.min(...t).toFixed(2).padStart(7)}`);
}
