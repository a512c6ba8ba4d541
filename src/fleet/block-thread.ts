/**
 * Thread entry of a fleet worker's block pool (piscina, see `serveBlocks`): computes one block's E-step
 * counts or score with the same functions as `fit --workers` (`accumulateBlock`, `scoreBlock`), so a
 * block's numbers are bit-identical wherever it runs, and packs the result (`packBlockResult`). The
 * runs and the model arrive in shared memory; the kernels' view of the last model is kept per thread.
 * The computation runs off the worker's main thread so that thread keeps renewing the jobs' locks.
 */
import type { SparseChain } from '../kernels/sparse-chain.js';
import { chainFromModel } from '../model/chain-from-model.js';
import type { TransitionMode } from '../model/hmm-model.js';
import { accumulateBlock } from '../fit/accumulate-block.js';
import { EStepWorkspace } from '../fit/e-step-workspace.js';
import type { ModelMessage } from '../fit/model-message.js';
import type { PackedRuns } from '../fit/packed-runs.js';
import { scoreBlock } from '../fit/score-block.js';
import { packBlockResult, type ResultTag } from './result-payload.js';

export interface ThreadTask {
  tag: ResultTag;
  packed: PackedRuns;
  model: ModelMessage;
  mode: TransitionMode;
  prune: number;
  members: number[];
}

const ws = new EStepWorkspace();
let cached: { fit: string; version: number; chain: SparseChain } | null = null;

export default function computeBlock(task: ThreadTask): Uint8Array {
  const { tag } = task;
  if (cached === null || cached.fit !== tag.fit || cached.version !== tag.version) cached = { fit: tag.fit, version: tag.version, chain: chainFromModel(task.model) };
  const result =
    tag.kind === 'counts'
      ? accumulateBlock(cached.chain, task.packed, task.members, ws, task.mode, task.prune)
      : scoreBlock(cached.chain, task.packed, task.members, ws);
  return packBlockResult(result, tag);
}
