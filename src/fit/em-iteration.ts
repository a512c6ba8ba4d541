import { maximizeMovement } from '../model/maximize-movement.js';
import { marginalDwell } from '../model/marginal-dwell.js';
import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { maximizeModel, type MaximizeOptions } from '../model/maximize-model.js';
import { emissionLogPrior } from '../model/emission-log-prior.js';
import { LANES } from '../kernels/sparse-chain.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import { EStepWorkspace } from './e-step-workspace.js';
import { packRuns } from './packed-runs.js';
import { reduceBlocks } from './reduce-blocks.js';

export type { RunReadings } from './run-readings.js';
import type { RunReadings } from './run-readings.js';

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

/** Runs per E-step block: one lane group (`LANES`), the size `fit` uses by default. */
const BLOCK_SIZE = LANES;

/**
 * E-step over all runs under `model`, then the M-step: one Baum-Welch iteration. The E-step is the
 * fit's: runs in blocks of `LANES` in the order given, each block through the lane kernels
 * (`accumulateBlock`, per-link counts; WebAssembly SIMD where available) into its own accumulators, the
 * blocks added in order. A run that is impossible under the model stops the iteration with a WorkError
 * naming the run and the step at which its probability became zero; a non-finite count, with one
 * naming the cell.
 */
export function emIteration(
  model: HmmModel,
  runs: ReadonlyArray<RunReadings>,
  options: MaximizeOptions = {},
  ws: EStepWorkspace = new EStepWorkspace(),
): EmIterationResult {
  const chain = chainFromModel(model);
  const packed = packRuns(runs);
  const blocks: BlockCounts[] = [];
  for (let a = 0; a < runs.length; a += BLOCK_SIZE) {
    const block = Array.from({ length: Math.min(BLOCK_SIZE, runs.length - a) }, (_, k) => a + k);
    blocks.push(accumulateBlock(chain, packed, block, ws, 'learned'));
    if (blocks[blocks.length - 1].impossibleRun >= 0) break; // `reduceBlocks` names it
  }
  const counts = reduceBlocks(model, packed, blocks);
  const logPrior = emissionLogPrior(model, options.prior, options.priorStrength ?? 10);
  return {
    model: withMovementStep(model, maximizeModel(model, counts, options), counts, options),
    counts,
    logLik: counts.logLik,
    logPrior,
    objective: counts.logLik + logPrior,
  };
}

/** The movement M-step after `maximizeModel` (as `runEm` does): learned in `tied` mode, held otherwise. */
function withMovementStep(before: HmmModel, after: HmmModel, counts: ExpectedCountsTable, options: MaximizeOptions): HmmModel {
  if (!before.movement || !counts.move || (options.mode ?? 'tied') !== 'tied') return after;
  return { ...marginalDwell(after, counts, counts.move), movement: maximizeMovement(after, before.movement, counts.move) };
}
