import type { HmmModel } from '../model/hmm-model.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { emissionLogPrior } from '../model/emission-log-prior.js';
import { transitionLogPrior } from '../model/transition-log-prior.js';
import type { MaximizeOptions } from '../model/maximize-model.js';
import type { EmLoopOptions } from './em-loop-options.js';

/**
 * The EM objective of `model` whose E-step gave `counts`: log-likelihood + emission log prior +
 * transition log prior (each 0 when its strength is 0). EM with the MAP M-step of `maximizeModel`
 * never decreases it.
 */
export function emObjective(model: HmmModel, counts: ExpectedCountsTable, options: EmLoopOptions): number {
  return (
    counts.logLik +
    emissionLogPrior(model, options.prior, options.priorStrength) +
    transitionLogPrior(model, options.mode, options.transitionPriorStrength ?? 0, options.transitionCentre)
  );
}

/** The M-step options of an EM loop. */
export function maximizeOptionsOf(options: EmLoopOptions): MaximizeOptions {
  return {
    mode: options.mode,
    priorStrength: options.priorStrength,
    prior: options.prior,
    transitionPriorStrength: options.transitionPriorStrength,
    transitionCentre: options.transitionCentre,
  };
}
