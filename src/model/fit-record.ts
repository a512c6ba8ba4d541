import type { TransitionMode } from './hmm-model.js';

/** Why an EM loop stopped. */
export type StopReason = 'converged' | 'max-iter' | 'resumed-converged';

/** One EM loop (a restart or the final pass), as recorded in the model file. */
export interface LoopRecord {
  /** Seed the loop's starting point was drawn with. */
  seed: number;
  iterations: number;
  stopReason: StopReason;
  /** EM objective per reading (log-likelihood + log prior, divided by readings) before each M-step. */
  history: number[];
  /** Log-likelihood per reading of the runs the loop was fitted on, at its final parameters. */
  trainLogLikPerReading: number;
  /** Log-likelihood per reading of the held-out runs at its final parameters (null if none held out). */
  heldOutLogLikPerReading: number | null;
  /** Starting dwell (tied/fixed modes). */
  startDwell: number;
  /** Transition mode of this loop, recorded when `--transitions auto` fitted several modes. */
  mode?: TransitionMode;
}

/** `fit --transitions`: one mode, or `auto` (fit the candidate modes and keep the best held-out). */
export type FitTransitions = TransitionMode | 'auto';

/** Every option of a fit, as used (defaults filled in). */
export interface FitOptions {
  restarts: number;
  holdout: number;
  holdoutCol: string | null;
  seed: number;
  transitions: FitTransitions;
  dwell: number;
  hit: number;
  priorStrength: number;
  /**
   * Pseudo-transitions per cell behind the transition prior of the `per-cell` and `learned` modes
   * (centred on the starting dwell with an equal split over links). Absent for `fixed`/`tied` fits,
   * which do not use it (so their model files are as before the option existed).
   */
  transitionPriorStrength?: number;
  maxIter: number;
  tol: number;
  finalPass: boolean;
  /** Runs per E-step block (fixed, so results do not depend on the worker count). */
  blockSize: number;
  /** Model the fit was warm-started from (`--from`), by content digest. */
  fromDigest: string | null;
  /**
   * `--prune EPS`: the pruned E-step's largest discarded share of forward mass per step (DEVELOPERS.md,
   * "Pruned E-step"). Absent for exact fits, so their model files are as before the option existed.
   */
  prune?: number;
}

/** Provenance of a fitted model (docs/formats.md, "Model file", the fit record). */
export interface FitRecord {
  tool: string;
  toolVersion: string;
  floorDigest: string;
  runsDigests: Array<{ file: string; sha256: string }>;
  options: FitOptions;
  split: { fit: string[]; heldOut: string[] };
  nReadings: { fit: number; heldOut: number };
  restarts: LoopRecord[];
  /** Index into `restarts` of the restart chosen by held-out log-likelihood per reading. */
  selected: number;
  selectedBy: 'held-out' | 'training';
  finalPass: LoopRecord | null;
  /**
   * Expected readings per cell (rows, cell order) and surface (columns) over all runs under the final
   * model: the evidence behind each emission row, used by `compare` to test later runs against it.
   */
  cellReadings?: number[][];
  /**
   * Label-free calibration of the selected restart's model on the held-out runs (before the final
   * pass): its one-step-ahead reading forecasts against the readings that came (null when nothing was
   * held out). See `predictiveCalibration` (src/fit/predictive-calibration.ts).
   */
  predictiveCalibration?: PredictiveCalibration | null;
}

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
