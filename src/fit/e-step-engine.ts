import type { HmmModel } from '../model/hmm-model.js';
import type { BlockCounts } from './accumulate-block.js';
import type { BlockScore } from './score-block.js';

/**
 * Runs E-steps and scores over blocks of packed runs, in this process or in worker threads. Results
 * come back per block, in block order; the caller reduces them in that order, so the sums do not depend
 * on how many workers there are.
 */
export interface EStepEngine {
  readonly workers: number;
  counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]>;
  score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]>;
  close(): Promise<void>;
}
