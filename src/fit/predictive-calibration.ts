import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { predictiveReliability } from '../kernels/predictive-reliability.js';

/** One bin of the reliability table of the model's top reading forecasts. */
export interface ReliabilityBin {
  /** Forecast probabilities in [lower, upper) (the last bin includes 1). */
  lower: number;
  upper: number;
  /** Forecasts in the bin (steps with a reading whose top forecast fell here). */
  count: number;
  /** Mean forecast probability in the bin (null when empty). */
  meanPredicted: number | null;
  /** Share of those forecasts that came true (null when empty). */
  observed: number | null;
}

/**
 * Label-free calibration of a model on runs: at every step with a reading, the model's most likely next
 * reading given the readings before it (one-step-ahead forecast from the forward pass) and its
 * probability, binned; `ece` = Σ_b (count_b / N)·|meanPredicted_b − observed_b| (expected calibration
 * error). The counts sum to the runs' readings. It checks the model's forecasts of readings, not its
 * positions: a model can forecast readings well and still place the robot in the wrong one of two
 * look-alike rooms.
 */
export interface PredictiveCalibration {
  /** What was forecast: the top reading of each step's one-step-ahead forecast. */
  forecast: 'top-reading';
  nReadings: number;
  bins: ReliabilityBin[];
  ece: number;
}

/** Number of equal-width probability bins of the reliability table. */
export const CALIBRATION_BINS = 10;

/**
 * The reliability table of `model`'s one-step-ahead top reading forecasts over `runs` (see
 * `PredictiveCalibration`). Returns null when the runs hold no reading. A run impossible under the
 * model contributes its steps up to the impossible reading.
 */
export function predictiveCalibration(model: HmmModel, runs: ReadonlyArray<Int32Array>, nBins = CALIBRATION_BINS): PredictiveCalibration | null {
  const chain = chainFromModel(model);
  const work = new Float64Array(2 * chain.nCells + chain.nReadings);
  const sums = new Float64Array(3 * nBins);
  for (const obs of runs) predictiveReliability(chain, obs, obs.length, nBins, work, sums);
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
