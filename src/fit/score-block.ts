import { LANES, type SparseChain } from '../kernels/sparse-chain.js';
import { fillLaneGroup } from '../kernels/fill-lane-group.js';
import { forwardSegment } from '../kernels/forward-segment.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { moveStepsOf, type PackedRuns } from './packed-runs.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { laneGroups } from './lane-groups.js';

export interface BlockScore {
  logLik: number;
  nReadings: number;
  /** Index (into the packed runs) of a run impossible under the model, or −1. */
  impossibleRun: number;
}

/** Forward rows kept while scoring: a short rolling window that stays in cache (about 256 KiB, ≥ 8 rows). */
const WINDOW_BYTES = 256 * 1024;
const MIN_WINDOW = 8;

/**
 * Σ log P(readings) of one block of runs, added in block order. Forward pass only, in a rolling window
 * of rows (memory independent of run length); runs of similar length go through the lane kernels
 * (`ws.preparedLanes`) up to `LANES` at a time (the grouping of `accumulateBlock`), a run left alone through
 * `forwardSegment`. A run's log-likelihood is the same number either way, and the same as the E-step's.
 */
export function scoreBlock(chain: SparseChain, packed: PackedRuns, runs: ArrayLike<number>, ws: EStepWorkspace): BlockScore {
  const obsOf = (r: number): Int32Array => packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]);
  const logs = new Float64Array(runs.length);
  const laneLogs = new Float64Array(LANES);
  if (chain.move && packed.dBin) {
    for (let b = 0; b < runs.length; b++) logs[b] = scoreMoveOne(chain, obsOf(runs[b]), moveStepsOf(packed, runs[b]), ws);
  } else for (const members of laneGroups(runs, packed.offsets)) {
    if (members.length === 1) {
      logs[members[0]] = scoreOne(chain, obsOf(runs[members[0]]), ws);
    } else {
      scoreLanes(chain, members.map((b) => obsOf(runs[b])), ws, laneLogs);
      members.forEach((b, k) => (logs[b] = laneLogs[k]));
    }
  }
  let logLik = 0;
  let nReadings = 0;
  for (let b = 0; b < runs.length; b++) {
    if (logs[b] === -Infinity) return { logLik: -Infinity, nReadings, impossibleRun: runs[b] };
    logLik += logs[b];
    const obs = obsOf(runs[b]);
    for (let t = 0; t < obs.length; t++) if (obs[t] >= 0) nReadings++;
  }
  return { logLik, nReadings, impossibleRun: -1 };
}

function scoreMoveOne(chain: SparseChain, obs: Int32Array, steps: MoveSteps, ws: EStepWorkspace): number {
  const n = chain.nCells;
  const T = obs.length;
  const window = Math.max(MIN_WINDOW, Math.floor(WINDOW_BYTES / (8 * n)) - 1);
  ws.ensure(n, chain.nReadings, chain.outPtr[n], T, window);
  const work = ws.moveWork(n);
  let logP = 0;
  for (let a = 0; a < T; a += window) {
    const b = Math.min(T, a + window);
    if (a > 0) ws.table.copyWithin(0, window * n, (window + 1) * n);
    logP = forwardMoveSegment(chain, chain.move!, obs, steps, a, b, ws.table, ws.scale, logP, work);
    if (logP === -Infinity) break;
  }
  return logP;
}

function scoreOne(chain: SparseChain, obs: Int32Array, ws: EStepWorkspace): number {
  const n = chain.nCells;
  const T = obs.length;
  const window = Math.max(MIN_WINDOW, Math.floor(WINDOW_BYTES / (8 * n)) - 1);
  ws.ensure(n, chain.nReadings, chain.outPtr[n], T, window);
  let logP = 0;
  for (let a = 0; a < T; a += window) {
    const b = Math.min(T, a + window);
    if (a > 0) ws.table.copyWithin(0, window * n, (window + 1) * n);
    logP = forwardSegment(chain, obs, a, b, ws.table, ws.scale, logP);
    if (logP === -Infinity) break;
  }
  return logP;
}

function scoreLanes(chain: SparseChain, runs: Int32Array[], ws: EStepWorkspace, logOut: Float64Array): void {
  const n = chain.nCells;
  const row = LANES * n;
  const group = fillLaneGroup(runs, n, chain.nReadings, ws.group);
  const T = group.nSteps;
  const window = Math.max(MIN_WINDOW, Math.floor(WINDOW_BYTES / (8 * row)) - 1);
  const lanes = ws.preparedLanes(chain, group, window);
  const table = lanes.table;
  logOut.fill(0);
  for (let a = 0; a < T; a += window) {
    const b = Math.min(T, a + window);
    if (a > 0) table.copyWithin(0, window * row, (window + 1) * row);
    lanes.forward(a, b, logOut);
  }
}
