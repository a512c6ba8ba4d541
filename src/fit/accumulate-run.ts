import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardScaled } from '../kernels/forward-scaled.js';
import { expectedCounts } from '../kernels/expected-counts.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { EStepWorkspace } from './e-step-workspace.js';

/**
 * E-step of one run: scaled forward, then the fused backward + expected-counts pass, added into
 * `counts`. Returns the run's log-likelihood; when the run is impossible under the model (−Infinity)
 * nothing is added and `impossibleStep()` of the workspace scale tells where.
 */
export function accumulateRun(
  chain: SparseChain,
  obs: Int32Array,
  counts: ExpectedCountsTable,
  ws: EStepWorkspace,
): number {
  const nSteps = obs.length;
  ws.ensure(chain.nCells, nSteps);
  const logP = forwardScaled(chain, obs, nSteps, ws.alpha, ws.scale);
  if (logP === -Infinity) return logP;
  expectedCounts(chain, obs, nSteps, ws.alpha, ws.scale, ws.work, counts.start, counts.trans, counts.emitT);
  let nReadings = 0;
  for (let t = 0; t < nSteps; t++) if (obs[t] >= 0) nReadings++;
  counts.logLik += logP;
  counts.nReadings += nReadings;
  counts.nRuns += 1;
  return logP;
}
