import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardPruned } from '../kernels/forward-pruned.js';
import { backwardPruned } from '../kernels/backward-pruned.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { addRunCounts } from './add-run-counts.js';
import { foldCounts } from './fold-counts.js';

/**
 * Pruned E-step of one run (`fit --prune EPS`): `forwardPruned` drops, at each step, the cells whose
 * forward mass is below a threshold that keeps the discarded share at most `eps`, and `backwardPruned`
 * visits the kept cells only; the counts (added into `counts` like `addRunCounts`) are the exact
 * counts of the model with its emissions masked to the kept cells. Returns the pruned filter's
 * log-likelihood L̂ (see `forwardPruned` for its bounds against the exact one).
 *
 * The kept cells are stored compactly (12 bytes per kept (step, cell) pair), so memory follows what is
 * kept, not steps × cells. Falls back to the exact `addRunCounts` (same counts as without pruning) when
 * the kept pairs would exceed `ws.plainLimitBytes` (no checkpointed pruned pass yet), or when the pruned filter loses
 * every path (a step no kept cell can explain), so a run possible under the model is never called
 * impossible because of pruning.
 */
export function addPrunedRunCounts(
  chain: SparseChain,
  obs: Int32Array,
  counts: ExpectedCountsTable,
  ws: EStepWorkspace,
  eps: number,
): number {
  const T = obs.length;
  const n = chain.nCells;
  if (T === 0) return addRunCounts(chain, obs, counts, ws);
  // Kept (step, cell) pairs take 12 bytes each; start from what the buffers hold (at least 64 per step)
  // and double on overflow, up to every pair or the workspace limit.
  const most = Math.min(T * n, Math.floor(ws.plainLimitBytes / 12));
  let capacity = Math.min(most, Math.max(ws.pruned?.kept.length ?? 0, T * Math.min(n, 64)));
  ws.ensure(n, chain.nReadings, chain.outPtr[n], T, 1);
  let b = ws.ensurePruned(n, T, capacity);
  let logP = forwardPruned(chain, obs, eps, ws.scale, b.kept, b.keptVal, b.keptPtr, b.acc, b.mark, b.cand, b.out);
  while (Number.isNaN(logP)) {
    if (capacity >= most) return addRunCounts(chain, obs, counts, ws);
    capacity = Math.min(most, 2 * capacity);
    b = ws.ensurePruned(n, T, capacity);
    logP = forwardPruned(chain, obs, eps, ws.scale, b.kept, b.keptVal, b.keptPtr, b.acc, b.mark, b.cand, b.out);
  }
  if (logP === -Infinity) return addRunCounts(chain, obs, counts, ws);
  ws.w.fill(0, 0, n);
  ws.wSpare.fill(0, 0, n);
  const acc = ws.counts;
  backwardPruned(chain, obs, ws.scale, b.kept, b.keptVal, b.keptPtr, ws.w, ws.wSpare, acc.emitCount, acc.linkCount, acc.dwellCount, acc.startCount);
  foldCounts(chain, acc, counts, true);
  return logP;
}
