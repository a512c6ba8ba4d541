import { describe, it, expect } from 'vitest';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';
import { LANES, type SparseChain } from '../../src/kernels/sparse-chain.js';
import { fillLaneGroup } from '../../src/kernels/fill-lane-group.js';
import { forwardMoveLanes, type MoveLaneGroup } from '../../src/kernels/forward-move-lanes.js';
import { backwardMoveLanes, type MoveLaneAccumulators } from '../../src/kernels/backward-move-lanes.js';
import { WasmMoveLaneKernels } from '../../src/kernels/wasm-move-lane-kernels.js';
import { wasmModule } from '../../src/kernels/wasm-module.js';
import { forwardMoveLanesWasm } from '../../src/kernels/forward-move-lanes-wasm.js';
import { backwardMoveLanesWasm } from '../../src/kernels/backward-move-lanes-wasm.js';
import { HEADING_BINS, DISTANCE_BINS, type MoveSteps } from '../../src/kernels/move-chain.js';
import { accumulateMoveLanes } from '../../src/fit/accumulate-move-lanes.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { randomMoveModel } from '../helpers/movement-oracle.js';

// Oracle: the JavaScript movement lane kernels (`forwardMoveLanes`, `backwardMoveLanes`), themselves
// checked against brute-force enumeration in test/reference/brute-force-movement.test.ts. The
// WebAssembly kernels do the same arithmetic in the same order in every lane, and add masked lanes as
// an exact +0 where the JavaScript kernels branch: the same numbers, bit for bit (toEqual, no tolerance).

interface TinyRun {
  obs: Int32Array;
  moves: MoveSteps;
}

/**
 * A random run of `T` steps with odometry: distances of zero, small and large (up to past the 20 m
 * bin), unknown distances and headings, and gaps — missing steps read as dropouts whose movement is
 * the row after the gap's, shared equally over the gap's transitions with the same heading.
 */
function tinyRun(rng: SeededRandom, T: number, nReadings: number): TinyRun {
  const obs = new Int32Array(T);
  const moved = new Float64Array(T).fill(NaN);
  const heading = new Float64Array(T).fill(NaN);
  let t = 0;
  while (t < T) {
    const gap = rng.next() < 0.15 ? 1 + rng.int(3) : 0;
    const end = Math.min(T - 1, t + gap);
    for (let u = t; u < end; u++) obs[u] = -1;
    obs[end] = rng.next() < 0.1 ? -1 : rng.int(nReadings);
    const r = rng.next();
    const d = r < 0.2 ? 0 : r < 0.3 ? NaN : r < 0.35 ? 25 * rng.next() : 1.5 * rng.next();
    const h = rng.next() < 0.3 ? NaN : 360 * rng.next();
    for (let u = t; u <= end; u++) {
      moved[u] = d / (end - t + 1);
      heading[u] = h;
    }
    t = end + 1;
  }
  return { obs, moves: moveStepsFromOdometry(moved, heading) };
}

function laneMoves(runs: TinyRun[], T: number): MoveLaneGroup {
  const dBin = new Int32Array(T * LANES).fill(-1);
  const hBin = new Int32Array(T * LANES).fill(-1);
  runs.forEach((r, k) => {
    for (let t = 0; t < r.obs.length; t++) {
      dBin[t * LANES + k] = r.moves.dBin[t];
      hBin[t * LANES + k] = r.moves.hBin[t];
    }
  });
  return { dBin, hBin };
}

function freshAcc(n: number, m: number): MoveLaneAccumulators {
  return {
    emitCount: new Float64Array((m + 1) * n),
    startCount: new Float64Array(n),
    dwellCount: new Float64Array(n),
    moveCount: new Float64Array(n),
    stayByDistance: new Float64Array(DISTANCE_BINS),
    moveByDistance: new Float64Array(DISTANCE_BINS),
    moveByHeading: new Float64Array((HEADING_BINS + 1) * n),
    headingCos: new Float64Array(HEADING_BINS + 1),
    headingSin: new Float64Array(HEADING_BINS + 1),
  };
}

/**
 * The accumulators as arrays, without the rows of unknown heading (`moveByHeading`'s last row, the last
 * entry of `headingCos` / `headingSin`): the M-step discards them and the WebAssembly kernel skips them.
 */
const plain = (acc: MoveLaneAccumulators, n: number): Record<string, number[]> =>
  Object.fromEntries(
    Object.entries(acc).map(([k, v]) => {
      const x = Array.from(v as Float64Array);
      return [k, k === 'moveByHeading' ? x.slice(0, HEADING_BINS * n) : k === 'headingCos' || k === 'headingSin' ? x.slice(0, HEADING_BINS) : x];
    }),
  );

/** A whole forward-backward pass of one group in segments of `segment` steps, by the JavaScript lanes. */
function passJs(chain: SparseChain, runs: TinyRun[], segment: number) {
  const n = chain.nCells;
  const row = LANES * n;
  const group = fillLaneGroup(runs.map((r) => r.obs), n, chain.nReadings);
  const T = group.nSteps;
  const moves = laneMoves(runs, T);
  const nSeg = Math.ceil(T / segment);
  const table = new Float64Array((segment + 1) * row);
  const scale = new Float64Array(T * LANES);
  const work = new Float64Array(2 * row);
  const w = new Float64Array(row);
  const wSpare = new Float64Array(row);
  const acc = freshAcc(n, chain.nReadings);
  const checkpoints = new Float64Array(nSeg * row);
  const logs = new Float64Array(LANES);
  const tables: number[][] = [];
  for (let g = 0; g < nSeg; g++) {
    if (g > 0) {
      table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(table.subarray(0, row), g * row);
    }
    const b = Math.min(T, (g + 1) * segment);
    forwardMoveLanes(chain, chain.move!, group, moves, g * segment, b, table, scale, logs, work);
    tables.push(Array.from(table.subarray(row, (b - g * segment + 1) * row)));
  }
  for (let g = nSeg - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSeg - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      forwardMoveLanes(chain, chain.move!, group, moves, a, b, table, scale, new Float64Array(LANES), work);
    }
    backwardMoveLanes(chain, chain.move!, group, moves, a, b, table, scale, w, wSpare, acc);
  }
  return { logs: Array.from(logs), tables, acc: plain(acc, n) };
}

/** The same pass through `WasmMoveLaneKernels`. */
function passWasm(kernels: WasmMoveLaneKernels, chain: SparseChain, runs: TinyRun[], segment: number) {
  const n = chain.nCells;
  const row = LANES * n;
  const group = fillLaneGroup(runs.map((r) => r.obs), n, chain.nReadings);
  const T = group.nSteps;
  const nSeg = Math.ceil(T / segment);
  expect(kernels.prepare(chain, group, laneMoves(runs, T), segment)).toBe(true);
  const checkpoints = new Float64Array(nSeg * row);
  const logs = new Float64Array(LANES);
  const tables: number[][] = [];
  for (let g = 0; g < nSeg; g++) {
    if (g > 0) {
      kernels.table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(kernels.table.subarray(0, row), g * row);
    }
    const b = Math.min(T, (g + 1) * segment);
    kernels.forward(g * segment, b, logs);
    tables.push(Array.from(kernels.table.subarray(row, (b - g * segment + 1) * row)));
  }
  kernels.resetBackward();
  for (let g = nSeg - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSeg - 1) {
      if (g > 0) kernels.table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      kernels.forward(a, b, new Float64Array(LANES));
    }
    kernels.backward(a, b);
  }
  const out = { logs: Array.from(logs), tables, acc: plain(kernels.accumulators, n) };
  for (const x of Object.values(kernels.accumulators)) (x as Float64Array).fill(0);
  return out;
}

describe('WebAssembly movement lane kernels against the JavaScript movement lanes', () => {
  it('the module is valid WebAssembly and this runtime (Node 20) compiles it', () => {
    const bytes = wasmModule([
      { name: 'forward', fn: forwardMoveLanesWasm() },
      { name: 'backward', fn: backwardMoveLanesWasm() },
    ]);
    expect(WebAssembly.validate(bytes)).toBe(true);
    expect(WasmMoveLaneKernels.available()).toBe(true);
  });

  const rng = new SeededRandom(20261205);
  const kernels = WasmMoveLaneKernels.create()!;
  for (let trial = 0; trial < 24; trial++) {
    const nCells = 1 + rng.int(7);
    const nReadings = 2 + rng.int(3);
    const seed = rng.nextUint32();
    const nRuns = 2 + rng.int(7);
    const runs = Array.from({ length: nRuns }, () => tinyRun(rng, 1 + rng.int(40), nReadings));
    const T = Math.max(...runs.map((r) => r.obs.length));
    const segment = trial % 3 === 0 ? T : 1 + rng.int(T);
    it(`tables, log-likelihoods and every count are the same bit for bit (trial ${trial}: ${nCells} cells, ${nRuns} lanes up to ${T} steps, segments of ${segment})`, () => {
      const chain = chainFromModel(randomMoveModel(seed, nCells, nReadings));
      const js = passJs(chain, runs, segment);
      // One kernels object for every trial: its memory grows and shrinks nothing, chains change.
      const wasm = passWasm(kernels, chain, runs, segment);
      expect(wasm.logs).toEqual(js.logs);
      expect(wasm.tables).toEqual(js.tables);
      expect(wasm.acc).toEqual(js.acc);
      // Not vacuous: the runs were possible, and both distance and heading counts were made.
      expect(js.logs.slice(0, nRuns).every(Number.isFinite)).toBe(true);
      expect(js.acc.emitCount.some((x) => x > 0)).toBe(true);
    });
  }

  it('accumulateMoveLanes gives the same counts table bit for bit with WebAssembly and with JavaScript', () => {
    const local = new SeededRandom(77);
    const model = randomMoveModel(5, 6, 3);
    const chain = chainFromModel(model);
    const runs = Array.from({ length: 8 }, () => tinyRun(local, 30 + local.int(30), 3));
    const packed = packRuns(runs.map((r, k) => ({ id: `r${k}`, obs: r.obs, moves: r.moves })));
    const results = [true, false].map((useWasm) => {
      const ws = new EStepWorkspace();
      ws.useWasm = useWasm;
      ws.plainLimitBytes = 8 * LANES * 6 * 7; // segments of 6 steps: checkpointed
      const counts = emptyCounts(chain.nCells, chain.nnz, chain.nReadings, true);
      const logs = new Float64Array(LANES);
      expect(accumulateMoveLanes(chain, packed, [0, 1, 2, 3, 4, 5, 6, 7], counts, ws, logs)).toBe(true);
      expect(ws.useWasm).toBe(useWasm);
      return { logs: Array.from(logs), counts: JSON.parse(JSON.stringify(counts, (_, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v))) };
    });
    expect(results[0]).toEqual(results[1]);
    expect(results[0].counts.move.stayByDistance.some((x: number) => x > 0)).toBe(true);
    expect(results[0].counts.move.headingCos.some((x: number) => x !== 0)).toBe(true);
  });
});
