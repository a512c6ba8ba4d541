/**
 * Worker-thread entry for the E-step pool: the packed runs arrive once in `workerData` (shared memory);
 * each task names a model (shared memory too, see `ModelMessage`) and one block of runs, and returns the
 * block's counts or score. The kernels' view of the last model seen is kept, so a worker builds it once
 * per EM iteration rather than once per block.
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

export interface WorkerTask {
  kind: 'counts' | 'score';
  model: ModelMessage;
  block: number[];
  /** The M-step the counts are for (see `accumulateBlock`). */
  mode: TransitionMode;
}

const packed = (workerData as { packed: PackedRuns }).packed;
const ws = new EStepWorkspace();
let cached: { version: number; chain: SparseChain } | null = null;

export default function runTask(task: WorkerTask): BlockCounts | BlockScore {
  if (cached === null || cached.version !== task.model.version) cached = { version: task.model.version, chain: chainFromModel(task.model) };
  const chain = cached.chain;
  if (task.kind === 'counts') return accumulateBlock(chain, packed, task.block, ws, task.mode);
  return scoreBlock(chain, packed, task.block, ws);
}
