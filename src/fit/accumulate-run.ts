import type { SparseChain } from '../kernels/sparse-chain.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { addRunCounts } from './add-run-counts.js';

/**
 * E-step of one run: its expected counts (`addRunCounts`: scaled forward, then the fused backward +
 * counts pass, checkpointed for long runs), log-likelihood, reading count and run count, added into
 * `counts`. Returns the run's log-likelihood; when the run is impossible under the model (−Infinity)
 * nothing is added.
 */
export function accumulateRun(chain: SparseChain, obs: Int32Array, counts: ExpectedCountsTable, ws: EStepWorkspace): number {
  const logP = addRunCounts(chain, obs, counts, ws);
  if (logP === -Infinity) return logP;
  let nReadings = 0;
  for (let t = 0; t < obs.length; t++) if (obs[t] >= 0) nReadings++;
  counts.logLik += logP;
  counts.nReadings += nReadings;
  counts.nRuns += 1;
  return logP;
}
