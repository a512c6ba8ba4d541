import type { TransitionMode } from '../model/hmm-model.js';

/** What one EM loop fits and when it stops (mode, priors, iteration limit, tolerance). */
export interface EmLoopOptions {
  mode: TransitionMode;
  priorStrength: number;
  prior: Float64Array;
  maxIter: number;
  tol: number;
  /** Pseudo-transitions per cell behind the transition prior (`learned`, `per-cell`). @default 0 */
  transitionPriorStrength?: number;
  /** Centre of the transition prior, CSR order (the floor's movement model). */
  transitionCentre?: Float64Array;
  /**
   * Largest fall of the objective (total, not per reading) taken as convergence rather than a defect:
   * the pruned E-step (`fit --prune`) is approximate, so its objective may fall by up to twice its
   * bound. @default 0
   */
  decreaseSlack?: number;
  /**
   * Also require the gain still to come, projected from the last three objectives (Aitken, see
   * `emConverged` in `em-converged.ts`), to be below `tol`: for EM that creeps along flat directions (the look-alike cells'
   * dwells and link splits of `per-cell` and `learned`), where a small change per iteration does not
   * mean the fit has stopped moving. @default false
   */
  projected?: boolean;
}
