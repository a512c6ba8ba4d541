import type { LoopRecord } from './fit-record.js';
import type { MovementParams } from './hmm-model.js';

/** Format marker of fit checkpoints. */
export const CHECKPOINT_FORMAT = 'underfoot-fit-checkpoint/1';

/** The numbers of a model that change during a fit (structure and names come from the floor). */
export interface CheckpointParams {
  start: number[];
  trans: number[];
  emission: number[];
  /** Movement parameters, when the fit uses odometry. */
  movement?: MovementParams;
}

/** Where an interrupted loop stood after its last M-step. */
export interface CheckpointLoop {
  phase: 'restart' | 'final';
  /** Restart index (for the final pass: the selected restart). */
  index: number;
  iterations: number;
  history: number[];
  params: CheckpointParams;
}

/**
 * Everything needed to resume a fit exactly: finished restarts (records and final parameters) and the
 * loop in progress. `key` ties it to the inputs and options it was made for.
 */
export interface FitCheckpoint {
  format: typeof CHECKPOINT_FORMAT;
  key: string;
  done: Array<{ record: LoopRecord; params: CheckpointParams }>;
  current: CheckpointLoop | null;
}
