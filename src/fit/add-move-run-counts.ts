import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import type { MoveAccumulators } from '../kernels/backward-move-segment.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { backwardMoveSegment } from '../kernels/backward-move-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { foldCounts } from './fold-counts.js';

/**
 * `addRunCounts` for a run with odometry under a chain with movement tables: the forward pass
 * (`forwardMoveSegment`) and the fused backward + counts pass (`backwardMoveSegment`), checkpointed the
 * same way. Plain counts (steps whose distance is unknown) go into `counts.start/trans/emitT`, the
 * movement counts into `counts.move`. Returns the log-likelihood (−Infinity: nothing added).
 */
export function addMoveRunCounts(
  chain: SparseChain,
  obs: Int32Array,
  steps: MoveSteps,
  counts: ExpectedCountsTable,
  moveAcc: MoveAccumulators,
  ws: EStepWorkspace,
): number {
  const move = chain.move!;
  const T = obs.length;
  const n = chain.nCells;
  const nLinks = chain.outPtr[n];
  const segment = segmentSteps(T, n * 8, ws.plainLimitBytes);
  const nSegments = T === 0 ? 0 : Math.ceil(T / segment);
  ws.ensure(n, chain.nReadings, nLinks, T, segment);
  const checkpoints = nSegments > 1 ? ws.ensureCheckpoints(nSegments * n) : ws.checkpoints;
  const { table, scale } = ws;
  const acc = ws.counts;
  const work = ws.moveWork(n);
  let logP = 0;
  for (let g = 0; g < nSegments; g++) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g > 0) {
      table.copyWithin(0, segment * n, (segment + 1) * n);
      checkpoints.set(table.subarray(0, n), g * n);
    }
    logP = forwardMoveSegment(chain, move, obs, steps, a, b, table, scale, logP, work);
    if (logP === -Infinity) return logP;
  }
  ws.w.fill(0, 0, n);
  for (let g = nSegments - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSegments - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * n, (g + 1) * n), 0);
      forwardMoveSegment(chain, move, obs, steps, a, b, table, scale, 0, work);
    }
    backwardMoveSegment(chain, move, obs, steps, a, b, table, scale, ws.w, ws.wSpare, acc.emitCount, acc.linkCount, acc.dwellCount, acc.startCount, moveAcc);
  }
  foldCounts(chain, acc, counts, true);
  return logP;
}
