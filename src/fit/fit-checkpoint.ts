import type { MovementParams } from '../model/hmm-model.js';
import type { LoopRecord } from './fit-record.js';

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
  format: 'underfoot-fit-checkpoint/1';
  key: string;
  done: Array<{ record: LoopRecord; params: CheckpointParams }>;
  current: CheckpointLoop | null;
}

/** Where checkpoints live (implemented in src/io/; the fit only sees this interface). */
export interface CheckpointStore {
  /** Human-readable location, for messages. */
  readonly where: string;
  load(): Promise<FitCheckpoint | null>;
  save(checkpoint: FitCheckpoint): Promise<void>;
  clear(): Promise<void>;
}
