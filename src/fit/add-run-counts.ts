import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardSegment } from '../kernels/forward-segment.js';
import { backwardCountsSegment } from '../kernels/backward-counts-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { foldCounts } from './fold-counts.js';

/**
 * Expected counts of one run — the scaled forward pass (`forwardSegment`), then the fused backward +
 * expected-counts pass (`backwardCountsSegment`) — added into the `start`, `trans` (per link) and
 * `emitT` tables of `counts`; the log-likelihood, reading and run totals are left to the caller.
 * Returns the run's log-likelihood; when the run is impossible under the model (−Infinity) nothing is
 * added.
 *
 * A run whose forward table would exceed `ws.plainLimitBytes` is done as a checkpointed
 * forward-backward (`segmentSteps`): the forward pass keeps only the vector at the entry of each
 * segment, and the backward pass recomputes each segment's rows from its checkpoint (bit-identical to
 * the first pass, so the results do not depend on the segmenting); memory stays near the limit, or
 * grows as √T for very long runs.
 */
export function addRunCounts(
  chain: SparseChain,
  obs: Int32Array,
  counts: ExpectedCountsTable,
  ws: EStepWorkspace,
): number {
  const T = obs.length;
  const n = chain.nCells;
  const nLinks = chain.outPtr[n];
  const segment = segmentSteps(T, n * 8, ws.plainLimitBytes);
  const nSegments = T === 0 ? 0 : Math.ceil(T / segment);
  ws.ensure(n, chain.nReadings, nLinks, T, segment);
  const checkpoints = nSegments > 1 ? ws.ensureCheckpoints(nSegments * n) : ws.checkpoints;
  const { table, scale } = ws;
  const acc = ws.counts;

  // Forward, segment by segment; row 0 of the table carries the previous segment's last row.
  let logP = 0;
  for (let g = 0; g < nSegments; g++) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g > 0) {
      table.copyWithin(0, segment * n, (segment + 1) * n);
      checkpoints.set(table.subarray(0, n), g * n);
    }
    logP = forwardSegment(chain, obs, a, b, table, scale, logP);
    if (logP === -Infinity) return logP;
  }

  // Backward with counts, last segment first; earlier segments are recomputed from their checkpoints.
  ws.w.fill(0, 0, n);
  for (let g = nSegments - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSegments - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * n, (g + 1) * n), 0);
      forwardSegment(chain, obs, a, b, table, scale, 0);
    }
    backwardCountsSegment(chain, obs, a, b, table, scale, ws.w, ws.wSpare, acc.emitCount, acc.linkCount, acc.dwellCount, acc.startCount);
  }
  foldCounts(chain, acc, counts, true);
  return logP;
}
