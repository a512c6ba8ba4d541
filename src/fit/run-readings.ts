import type { MoveSteps } from '../kernels/move-chain.js';

/** A run as the fitting code sees it: its id (for messages) and its reading codes (−1 = dropout). */
export interface RunReadings {
  id: string;
  obs: Int32Array;
  /** Odometry bins (`moveStepsFromOdometry`), used when the model has movement parameters. */
  moves?: MoveSteps;
}
