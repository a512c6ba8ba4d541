import { LANES, type SparseChain } from '../kernels/sparse-chain.js';
import { HEADING_BINS } from '../kernels/move-chain.js';
import { fillLaneGroup } from '../kernels/fill-lane-group.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import { forwardMoveLanes } from '../kernels/forward-move-lanes.js';
import { backwardMoveLanes } from '../kernels/backward-move-lanes.js';
import { MoveLaneBuffers } from './move-lane-buffers.js';
import { WasmMoveLaneKernels } from '../kernels/wasm-move-lane-kernels.js';
import type { MoveLaneAccumulators } from '../kernels/backward-move-lanes.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { moveStepsOf, type PackedRuns } from './packed-runs.js';

/**
 * `accumulateLanes` for runs with odometry under a chain with movement tables: up to `LANES` runs
 * (packed indices `runs`) side by side through the movement lane kernels — `WasmMoveLaneKernels`
 * (WebAssembly SIMD) when `ws.useWasm` and the runtime allow, else `forwardMoveLanes` and
 * `backwardMoveLanes` (JavaScript; the same numbers, bit for bit) —
 * checkpointed above `ws.plainLimitBytes` the same way, the counts folded into `counts` in the totals
 * form of the `tied`/`fixed` M-step (each cell's dwell count at its dwell's position and its link total
 * at its first link's position) plus `counts.move`. Writes each run's log-likelihood into `logOut[k]`;
 * returns false (nothing added) when a run is impossible.
 */
export function accumulateMoveLanes(
  chain: SparseChain,
  packed: PackedRuns,
  runs: ReadonlyArray<number>,
  counts: ExpectedCountsTable,
  ws: EStepWorkspace,
  logOut: Float64Array,
): boolean {
  const move = chain.move!;
  const n = chain.nCells;
  const m = chain.nReadings;
  const row = LANES * n;
  const obs = runs.map((r) => packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]));
  const group = fillLaneGroup(obs, n, m, ws.group);
  const T = group.nSteps;
  const segment = segmentSteps(T, row * 8, ws.plainLimitBytes);
  const nSegments = T === 0 ? 0 : Math.ceil(T / segment);
  if (!ws.moveLanes) ws.moveLanes = new MoveLaneBuffers();
  const buf = ws.moveLanes;
  if (buf.moves.dBin.length < T * LANES) buf.moves = { dBin: new Int32Array(T * LANES), hBin: new Int32Array(T * LANES) };
  const { dBin, hBin } = buf.moves;
  dBin.fill(-1, 0, T * LANES);
  hBin.fill(-1, 0, T * LANES);
  runs.forEach((r, k) => {
    const steps = moveStepsOf(packed, r);
    for (let t = 0; t < steps.dBin.length; t++) {
      dBin[t * LANES + k] = steps.dBin[t];
      hBin[t * LANES + k] = steps.hBin[t];
    }
  });
  const checkpoints = nSegments > 1 ? ws.ensureCheckpoints(nSegments * row) : ws.checkpoints;
  logOut.fill(0, 0, LANES);
  const wasm = wasmMoveKernels(ws, buf);
  if (wasm?.prepare(chain, group, buf.moves, segment)) {
    const table = wasm.table;
    for (let g = 0; g < nSegments; g++) {
      const s0 = g * segment;
      const s1 = Math.min(T, s0 + segment);
      if (g > 0) {
        table.copyWithin(0, segment * row, (segment + 1) * row);
        checkpoints.set(table.subarray(0, row), g * row);
      }
      wasm.forward(s0, s1, logOut);
    }
    for (let k = 0; k < runs.length; k++) if (logOut[k] === -Infinity) return false;
    wasm.resetBackward();
    for (let g = nSegments - 1; g >= 0; g--) {
      const s0 = g * segment;
      const s1 = Math.min(T, s0 + segment);
      if (g < nSegments - 1) {
        if (g > 0) table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
        wasm.forward(s0, s1, ws.logs);
      }
      wasm.backward(s0, s1);
    }
    foldMoveCounts(chain, wasm.accumulators, counts);
    return true;
  }
  if (wasm !== null) ws.useWasm = false; // its memory could not grow: JavaScript from now on (same numbers)
  const grow = (x: Float64Array, size: number): Float64Array => (x.length < size ? new Float64Array(size) : x);
  buf.table = grow(buf.table, (segment + 1) * row);
  buf.scale = grow(buf.scale, T * LANES);
  buf.w = grow(buf.w, row);
  buf.wSpare = grow(buf.wSpare, row);
  buf.work = grow(buf.work, 2 * row);
  const a = buf.acc;
  a.emitCount = grow(a.emitCount, (m + 1) * n);
  a.startCount = grow(a.startCount, n);
  a.dwellCount = grow(a.dwellCount, n);
  a.moveCount = grow(a.moveCount, n);
  a.stayByDistance = grow(a.stayByDistance, move.stayByDistance.length);
  a.moveByDistance = grow(a.moveByDistance, move.stayByDistance.length);
  a.moveByHeading = grow(a.moveByHeading, (HEADING_BINS + 1) * n);
  a.headingCos = grow(a.headingCos, HEADING_BINS + 1);
  a.headingSin = grow(a.headingSin, HEADING_BINS + 1);
  const { table, scale, work } = buf;
  for (let g = 0; g < nSegments; g++) {
    const s0 = g * segment;
    const s1 = Math.min(T, s0 + segment);
    if (g > 0) {
      table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(table.subarray(0, row), g * row);
    }
    forwardMoveLanes(chain, move, group, buf.moves, s0, s1, table, scale, logOut, work);
  }
  for (let k = 0; k < runs.length; k++) if (logOut[k] === -Infinity) return false;
  buf.w.fill(0, 0, row);
  for (let g = nSegments - 1; g >= 0; g--) {
    const s0 = g * segment;
    const s1 = Math.min(T, s0 + segment);
    if (g < nSegments - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      forwardMoveLanes(chain, move, group, buf.moves, s0, s1, table, scale, ws.logs, work);
    }
    backwardMoveLanes(chain, move, group, buf.moves, s0, s1, table, scale, buf.w, buf.wSpare, a);
  }
  foldMoveCounts(chain, a, counts);
  return true;
}

/**
 * The WebAssembly movement lane kernels of this workspace (made on first use), or null for the
 * JavaScript ones: when `ws.useWasm` is false, WebAssembly SIMD is missing or its memory is refused.
 */
function wasmMoveKernels(ws: EStepWorkspace, buf: MoveLaneBuffers): WasmMoveLaneKernels | null {
  if (!ws.useWasm || !WasmMoveLaneKernels.available()) return null;
  if (buf.wasm === undefined) buf.wasm = WasmMoveLaneKernels.create();
  if (buf.wasm === null) ws.useWasm = false;
  return buf.wasm;
}

/** Folds the lane accumulators `a` into `counts` (totals form plus `counts.move`) and zeroes them. */
function foldMoveCounts(chain: SparseChain, a: MoveLaneAccumulators, counts: ExpectedCountsTable): void {
  const n = chain.nCells;
  const m = chain.nReadings;
  const { dwellPos, outPtr, outPos } = chain;
  for (let i = 0; i < n; i++) {
    counts.start[i] += a.startCount[i];
    if (dwellPos[i] >= 0) counts.trans[dwellPos[i]] += a.dwellCount[i];
    if (outPtr[i + 1] > outPtr[i]) counts.trans[outPos[outPtr[i]]] += a.moveCount[i];
  }
  for (let x = 0; x < m * n; x++) counts.emitT[x] += a.emitCount[x];
  const mv = counts.move!;
  for (let k = 0; k < mv.stayByDistance.length; k++) {
    mv.stayByDistance[k] += a.stayByDistance[k];
    mv.moveByDistance[k] += a.moveByDistance[k];
  }
  for (let x = 0; x < HEADING_BINS * n; x++) mv.moveByHeading[x] += a.moveByHeading[x];
  for (let b = 0; b < HEADING_BINS; b++) {
    mv.headingCos[b] += a.headingCos[b];
    mv.headingSin[b] += a.headingSin[b];
  }
  for (const x of [a.emitCount, a.startCount, a.dwellCount, a.moveCount, a.stayByDistance, a.moveByDistance, a.moveByHeading, a.headingCos, a.headingSin]) x.fill(0);
}
