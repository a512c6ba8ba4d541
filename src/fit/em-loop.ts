import type { HmmModel } from '../model/hmm-model.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { maximizeMovement } from '../model/maximize-movement.js';
import { marginalDwell } from '../model/marginal-dwell.js';
import { maximizeModel } from '../model/maximize-model.js';
import { emObjective, maximizeOptionsOf } from './em-objective.js';
import { InterruptedError, WorkError } from '../errors.js';
import type { EStepEngine } from './e-step-engine.js';
import type { PackedRuns } from './packed-runs.js';
import type { StopReason } from './fit-record.js';
import { reduceBlocks } from './reduce-blocks.js';
import { emConverged } from './em-converged.js';

export type { EmLoopOptions } from './em-loop-options.js';
import type { EmLoopOptions } from './em-loop-options.js';

/** Where a loop stands after an M-step: enough to continue it exactly (checkpoints). */
export interface EmLoopState {
  model: HmmModel;
  iterations: number;
  history: number[];
}

/** Checkpointing and interruption hooks of an EM loop. */
export interface EmLoopHooks {
  onIteration?: (iteration: number, objectivePerReading: number) => void;
  /** Continue from this state instead of `start` (a resumed fit). */
  resume?: EmLoopState;
  /** Called after every M-step (e.g. to save a checkpoint) before the next E-step. */
  afterStep?: (state: EmLoopState) => Promise<void>;
  /** Checked after every M-step (and its checkpoint): when aborted, the loop stops with `InterruptedError` (its checkpoint, if any, complete). */
  signal?: AbortSignal;
}


export interface EmLoopResult {
  model: HmmModel;
  iterations: number;
  stopReason: StopReason;
  /** Objective per reading under each model visited (the last entry is the returned model's). */
  history: number[];
  /** Log-likelihood per reading of the fitted runs under the returned model. */
  logLikPerReading: number;
  /** Expected counts of the fitted runs under the returned model (its E-step, reduced in block order). */
  counts: ExpectedCountsTable;
}

/** A decrease of the objective larger than this (relative) is a defect, not convergence. */
const DECREASE_TOLERANCE = 1e-9;

/**
 * The EM loop, in the order init → E-step → bound → M-step → report → stop: at each iteration the
 * E-step over all blocks (reduced in block order) gives the objective (log-likelihood + emission and
 * transition log priors, `emObjective`) per reading of the current model; the loop stops when its relative change from the previous
 * iteration is below `tol` (with `projected`, also the gain still to come: `emConverged`) ("converged") or after `maxIter` M-steps ("max-iter"). A decrease beyond
 * rounding stops the fit with an error: EM cannot decrease its objective, so it means a defect.
 */
export async function runEm(
  engine: EStepEngine,
  packed: PackedRuns,
  start: HmmModel,
  blocks: number[][],
  options: EmLoopOptions,
  hooks: EmLoopHooks = {},
): Promise<EmLoopResult> {
  const { onIteration, resume, afterStep, signal } = hooks;
  let model = resume ? resume.model : start;
  let iterations = resume ? resume.iterations : 0;
  const history: number[] = resume ? resume.history.slice() : [];
  for (;;) {
    const counts = reduceBlocks(model, packed, await engine.counts(model, blocks));
    const objective = emObjective(model, counts, options);
    const perReading = objective / Math.max(1, counts.nReadings);
    const previous = history.length ? history[history.length - 1] : undefined;
    history.push(perReading);
    onIteration?.(iterations, perReading);
    if (previous !== undefined) {
      const slack = (options.decreaseSlack ?? 0) / Math.max(1, counts.nReadings);
      if (slack > 0 && perReading < previous && perReading >= previous - slack) {
        return { model, iterations, stopReason: 'converged', history, logLikPerReading: counts.logLik / Math.max(1, counts.nReadings), counts };
      }
      if (perReading < previous - DECREASE_TOLERANCE * Math.abs(previous) - 1e-15) {
        throw new WorkError(
          `EM iteration ${iterations}: the objective must not decrease, got ${previous} → ${perReading} per reading; this is a defect, please report it with the inputs`,
        );
      }
      if (emConverged(history, options.tol, options.projected === true)) {
        return { model, iterations, stopReason: 'converged', history, logLikPerReading: counts.logLik / Math.max(1, counts.nReadings), counts };
      }
    }
    if (iterations >= options.maxIter) {
      return { model, iterations, stopReason: 'max-iter', history, logLikPerReading: counts.logLik / Math.max(1, counts.nReadings), counts };
    }
    const next = maximizeModel(model, counts, maximizeOptionsOf(options));
    // Movement parameters: learned in `tied` mode (a generalised EM step), held in `fixed` mode.
    model = model.movement && counts.move && options.mode === 'tied' ? { ...marginalDwell(next, counts, counts.move), movement: maximizeMovement(next, model.movement, counts.move) } : next;
    iterations++;
    if (afterStep) await afterStep({ model, iterations, history: history.slice() });
    if (signal?.aborted) throw new InterruptedError('the fit was interrupted', signal.reason === 'SIGTERM' ? 'SIGTERM' : 'SIGINT');
  }
}
