/**
 * Worker-thread entry of the E-step pool (`PoolEngine`, piscina): the packed runs arrive once in
 * `workerData` (shared memory). Each job names a model (shared memory too, see `ModelMessage`), the
 * blocks of the E-step or scoring and a shared counter; the worker takes blocks from the counter
 * (`takeBlocks`) until none is left — alongside the main thread and the other workers — and returns the
 * blocks it computed. The kernels' view of the last model seen is kept, so a worker builds it once per
 * model.
 */
import { workerData } from 'node:worker_threads';
import type { SparseChain } from '../kernels/sparse-chain.js';
import { chainFromModel } from '../model/chain-from-model.js';
import type { TransitionMode } from '../model/hmm-model.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { ModelMessage } from './model-message.js';
import type { PackedRuns } from './packed-runs.js';
import { scoreBlock, type BlockScore } from './score-block.js';
import { takeBlocks } from './take-blocks.js';

export interface WorkerJob {
  kind: 'counts' | 'score';
  model: ModelMessage;
  blocks: number[][];
  /** The M-step the counts are for (see `accumulateBlock`). */
  mode: TransitionMode;
  /** `fit --prune` (0 = exact E-step). */
  prune: number;
  /** Index of the next block not yet taken (shared by every thread working on this job). */
  next: Int32Array;
}

/** The blocks this worker computed, as [block index, result] pairs. */
export type WorkerReply = Array<[number, BlockCounts | BlockScore]>;

const packed = (workerData as { packed: PackedRuns }).packed;
const ws = new EStepWorkspace();
let cached: { version: number; chain: SparseChain } | null = null;

export default function runJob(job: WorkerJob): WorkerReply {
  if (cached === null || cached.version !== job.model.version) cached = { version: job.model.version, chain: chainFromModel(job.model) };
  const chain = cached.chain;
  const compute =
    job.kind === 'counts'
      ? (b: number): BlockCounts | BlockScore => accumulateBlock(chain, packed, job.blocks[b], ws, job.mode, job.prune)
      : (b: number): BlockCounts | BlockScore => scoreBlock(chain, packed, job.blocks[b], ws);
  return takeBlocks(job.next, job.blocks.length, compute);
}
