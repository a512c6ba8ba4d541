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
}

/** Every option of a fit, as used (defaults filled in). */
export interface FitOptions {
  restarts: number;
  holdout: number;
  holdoutCol: string | null;
  seed: number;
  transitions: TransitionMode;
  dwell: number;
  hit: number;
  priorStrength: number;
  maxIter: number;
  tol: number;
  finalPass: boolean;
  /** Runs per E-step block (fixed, so results do not depend on the worker count). */
  blockSize: number;
  /** Model the fit was warm-started from (`--from`), by content digest. */
  fromDigest: string | null;
}

/** Provenance of a fitted model (CONTRACT.md, model file `fit`). */
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
}
