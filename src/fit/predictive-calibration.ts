import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { predictiveReliability } from '../kernels/predictive-reliability.js';
import type { MoveSteps } from '../kernels/move-chain.js';

export type { ReliabilityBin, PredictiveCalibration } from '../model/fit-record.js';
import type { PredictiveCalibration, ReliabilityBin } from '../model/fit-record.js';

/** Number of equal-width probability bins of the reliability table. */
export const CALIBRATION_BINS = 10;

/**
 * The reliability table of `model`'s one-step-ahead top reading forecasts over `runs` (see
 * `PredictiveCalibration`). Returns null when the runs hold no reading. A run impossible under the
 * model contributes its steps up to the impossible reading. When the model has movement parameters,
 * a run with odometry (`moves[k]`) is forecast with its per-step transitions, as the fit and the
 * decoder use them; runs without (or a model without movement) use the plain transitions.
 */
export function predictiveCalibration(
  model: HmmModel,
  runs: ReadonlyArray<Int32Array>,
  nBins = CALIBRATION_BINS,
  moves?: ReadonlyArray<MoveSteps | undefined>,
): PredictiveCalibration | null {
  const chain = chainFromModel(model);
  const work = new Float64Array(2 * chain.nCells + chain.nReadings);
  const sums = new Float64Array(3 * nBins);
  runs.forEach((obs, k) => predictiveReliability(chain, obs, obs.length, nBins, work, sums, model.movement ? moves?.[k] : undefined));
  return calibrationFromSums(sums, nBins);
}

/** The table and its error from the kernel's bin sums (count, Σ predicted, Σ hits per bin). */
export function calibrationFromSums(sums: Float64Array, nBins: number): PredictiveCalibration | null {
  let total = 0;
  for (let b = 0; b < nBins; b++) total += sums[3 * b];
  if (total === 0) return null;
  let ece = 0;
  const bins: ReliabilityBin[] = [];
  for (let b = 0; b < nBins; b++) {
    const count = sums[3 * b];
    const meanPredicted = count > 0 ? sums[3 * b + 1] / count : null;
    const observed = count > 0 ? sums[3 * b + 2] / count : null;
    if (count > 0) ece += (count / total) * Math.abs(meanPredicted! - observed!);
    bins.push({ lower: b / nBins, upper: (b + 1) / nBins, count, meanPredicted, observed });
  }
  return { forecast: 'top-reading', nReadings: total, bins, ece };
}
