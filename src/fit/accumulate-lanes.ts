import { LANES, type SparseChain } from '../kernels/sparse-chain.js';
import { fillLaneGroup } from '../kernels/fill-lane-group.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { foldCounts } from './fold-counts.js';

/**
 * E-step of up to `LANES` runs side by side (the lane kernels, `ws.preparedLanes`: one pass over the
 * transitions serves every run of the group), added into `counts`. Writes each run's log-likelihood into
 * `logOut[k]` (−Infinity for a run impossible under the model) and returns false when any run was
 * impossible — then nothing is added, and the caller names the run. Counts are per link when `perLink`,
 * else only each row's dwell and link totals (see `ExpectedCountsTable.trans`). `logLik`, `nReadings`
 * and `nRuns` are left to the caller, who adds them in block order.
 *
 * A group whose forward table would exceed `ws.plainLimitBytes` is done as a checkpointed
 * forward-backward (`segmentSteps`; see `addRunCounts`).
 */
export function accumulateLanes(
  chain: SparseChain,
  runs: ReadonlyArray<Int32Array>,
  counts: ExpectedCountsTable,
  ws: EStepWorkspace,
  perLink: boolean,
  logOut: Float64Array,
): boolean {
  const n = chain.nCells;
  const row = LANES * n;
  const group = fillLaneGroup(runs, n, chain.nReadings, ws.group);
  const T = group.nSteps;
  const segment = segmentSteps(T, row * 8, ws.plainLimitBytes);
  const nSegments = T === 0 ? 0 : Math.ceil(T / segment);
  const lanes = ws.preparedLanes(chain, group, segment);
  const table = lanes.table;
  const checkpoints = nSegments > 1 ? ws.ensureCheckpoints(nSegments * row) : ws.checkpoints;
  logOut.fill(0, 0, LANES);

  for (let g = 0; g < nSegments; g++) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g > 0) {
      table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(table.subarray(0, row), g * row);
    }
    lanes.forward(a, b, logOut);
  }
  for (let k = 0; k < runs.length; k++) if (logOut[k] === -Infinity) return false;

  lanes.resetBackward();
  for (let g = nSegments - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSegments - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      lanes.forward(a, b, ws.logs);
    }
    lanes.backward(a, b, perLink);
  }
  foldCounts(chain, lanes.accumulators, counts, perLink);
  return true;
}
