/**
 * Worker-thread entry for the E-step pool: the packed runs arrive once in `workerData` (shared memory);
 * each task names a model and blocks of runs, and returns per-block counts or scores.
 */
import { workerData } from 'node:worker_threads';
import { chainFromModel } from '../model/chain-from-model.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { ModelMessage } from './model-message.js';
import type { PackedRuns } from './packed-runs.js';
import { scoreBlock, type BlockScore } from './score-block.js';

export interface WorkerTask {
  kind: 'counts' | 'score';
  model: ModelMessage;
  block: number[];
}

const packed = (workerData as { packed: PackedRuns }).packed;
const ws = new EStepWorkspace();

export default function runTask(task: WorkerTask): BlockCounts | BlockScore {
  const chain = chainFromModel(task.model);
  if (task.kind === 'counts') return accumulateBlock(chain, packed, task.block, ws);
  return scoreBlock(chain, packed, task.block, new Float64Array(2 * chain.nCells));
}
