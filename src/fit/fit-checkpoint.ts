import type { FitCheckpoint } from '../model/fit-checkpoint-data.js';

// The checkpoint's data types live in src/model (src/io reads and writes them).
export type { CheckpointParams, CheckpointLoop, FitCheckpoint } from '../model/fit-checkpoint-data.js';

/** Where checkpoints live (implemented in src/io/; the fit only sees this interface). */
export interface CheckpointStore {
  /** Human-readable location, for messages. */
  readonly where: string;
  load(): Promise<FitCheckpoint | null>;
  save(checkpoint: FitCheckpoint): Promise<void>;
  clear(): Promise<void>;
}
