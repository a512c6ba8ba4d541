import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { emptyCounts, type ExpectedCountsTable } from '../model/expected-counts-table.js';
import { maximizeModel, type MaximizeOptions } from '../model/maximize-model.js';
import { emissionLogPrior } from '../model/emission-log-prior.js';
import { WorkError } from '../errors.js';
import { accumulateRun } from './accumulate-run.js';
import { EStepWorkspace } from './e-step-workspace.js';
import { impossibleRunError } from './impossible-run-error.js';

/** A run as the fitting code sees it: its id (for messages) and its reading codes (−1 = dropout). */
export interface RunReadings {
  id: string;
  obs: Int32Array;
}

export interface EmIterationResult {
  /** The updated model (M-step output). */
  model: HmmModel;
  /** Expected counts under the input model. */
  counts: ExpectedCountsTable;
  /** Σ log P(readings) under the input model. */
  logLik: number;
  /** Emission log prior of the input model (0 when priorStrength is 0). */
  logPrior: number;
  /** logLik + logPrior: the quantity each EM iteration cannot decrease. */
  objective: number;
}

/**
 * E-step over all runs under `model`, then the M-step: one Baum-Welch iteration. Runs are accumulated
 * in the order given. A run that is impossible under the model stops the iteration with a WorkError
 * naming the run and the step at which its probability became zero.
 */
export function emIteration(
  model: HmmModel,
  runs: ReadonlyArray<RunReadings>,
  options: MaximizeOptions = {},
  ws: EStepWorkspace = new EStepWorkspace(),
): EmIterationResult {
  const chain = chainFromModel(model);
  const counts = emptyCounts(chain.nCells, chain.nnz, chain.nReadings);
  for (const run of runs) {
    const logP = accumulateRun(chain, run.obs, counts, ws);
    if (logP === -Infinity) throw impossibleRunError(model, run);
    if (!Number.isFinite(logP)) throw new WorkError(`run ${JSON.stringify(run.id)}: log-likelihood must be finite, got ${logP}`);
  }
  const logPrior = emissionLogPrior(model, options.prior, options.priorStrength ?? 10);
  return {
    model: maximizeModel(model, counts, options),
    counts,
    logLik: counts.logLik,
    logPrior,
    objective: counts.logLik + logPrior,
  };
}
