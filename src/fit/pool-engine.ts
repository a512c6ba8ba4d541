import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { SparseChain } from '../kernels/sparse-chain.js';
import { chainFromModel } from '../model/chain-from-model.js';
import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import { WorkError } from '../errors.js';
import { workerFailure } from './worker-failure.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import type { EStepEngine } from './e-step-engine.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { EngineOptions } from './local-engine.js';
import { modelMessage, type ModelMessage } from './model-message.js';
import type { PackedRuns } from './packed-runs.js';
import { scoreBlock, type BlockScore } from './score-block.js';
import type { WorkerJob, WorkerReply } from './e-step-worker.js';

/**
 * The E-step engine over `workers` threads: this one and `workers − 1` worker threads (piscina). Every
 * call gives each worker one job (the model, the blocks and a shared counter) and then works on the
 * same blocks itself: each thread takes the next block from the counter until none is left
 * (see `takeBlocks`), so the threads stay busy until the last block whatever their speed, and no message is
 * exchanged per block. Each worker returns the blocks it computed; results are placed by block index,
 * so they come back in block order whichever thread computed which block, and the sums the caller
 * reduces in that order do not depend on the number of threads.
 *
 * Why this thread works too: while the workers compute, it would only wait; working, it saves one
 * worker's start-up and memory, and it starts on the first E-step at once while the workers are still
 * starting (a worker that arrives late simply takes fewer blocks).
 *
 * The runs must be packed into shared memory (`packRuns(runs, true)`), so workers read them without
 * copies; each model is copied once into shared memory (`modelMessage`), so a job carries references.
 */
export class PoolEngine implements EStepEngine {
  private readonly mode: TransitionMode;
  private readonly prune: number;
  private readonly ws = new EStepWorkspace();
  private readonly pool: Piscina | null;
  private closed = false;
  private last: { model: HmmModel; message: ModelMessage; chain: SparseChain } | null = null;
  private version = 0;

  constructor(
    private readonly packed: PackedRuns,
    readonly workers: number,
    options: EngineOptions = {},
  ) {
    this.mode = options.mode ?? 'learned';
    this.prune = options.prune ?? 0;
    // Under tsx/vitest this file is TypeScript: the worker needs the tsx loader (DEVELOPERS.md, "Reference libraries and peers").
    const ts = import.meta.url.endsWith('.ts');
    const threads = Math.max(0, workers - 1);
    this.pool =
      threads === 0
        ? null
        : new Piscina({
            filename: fileURLToPath(new URL(`./e-step-worker.${ts ? 'ts' : 'js'}`, import.meta.url)),
            minThreads: threads,
            maxThreads: threads,
            idleTimeout: 60_000,
            workerData: { packed },
            execArgv: ts ? ['--import', 'tsx'] : [],
          });
  }

  counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]> {
    return this.run('counts', model, blocks, (chain, block) => accumulateBlock(chain, this.packed, block, this.ws, this.mode, this.prune)) as Promise<BlockCounts[]>;
  }

  score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]> {
    return this.run('score', model, blocks, (chain, block) => scoreBlock(chain, this.packed, block, this.ws)) as Promise<BlockScore[]>;
  }

  async close(): Promise<void> {
    this.closed = true;
    await this.pool?.destroy();
  }

  private async run(
    kind: WorkerJob['kind'],
    model: HmmModel,
    blocks: number[][],
    compute: (chain: SparseChain, block: number[]) => BlockCounts | BlockScore,
  ): Promise<Array<BlockCounts | BlockScore>> {
    if (this.closed) throw new WorkError('E-step pool: it must be open, got it closed');
    const { message, chain } = this.prepared(model);
    const next = new Int32Array(new SharedArrayBuffer(4));
    const job: WorkerJob = { kind, model: message, blocks, mode: this.mode, prune: this.prune, next };
    const pool = this.pool;
    const replies = pool ? Array.from({ length: this.workers - 1 }, () => pool.run(job) as Promise<WorkerReply>) : [];
    // Every reply is awaited, whatever happens here: a reply left pending would be rejected when the
    // pool closes, and an unhandled rejection ends the process with a stack trace.
    const settled = Promise.allSettled(replies);
    // This thread's share, taken from the counter as `takeBlocks` does, a block at a time; between blocks
    // the event loop runs, so that a worker that has just started gets its job (piscina hands it over
    // from this thread). Then the workers' shares.
    const results = new Array<BlockCounts | BlockScore>(blocks.length);
    try {
      for (let b = Atomics.add(next, 0, 1); b < blocks.length; b = Atomics.add(next, 0, 1)) {
        results[b] = compute(chain, blocks[b]);
        await yieldToEventLoop();
      }
    } catch (err) {
      Atomics.store(next, 0, blocks.length); // the workers take no further block
      await settled;
      throw err;
    }
    for (const reply of await settled) {
      if (reply.status === 'rejected') throw workerFailure(reply.reason);
      for (const [b, result] of reply.value) results[b] = result;
    }
    return results;
  }

  /** The shared-memory copy of `model` and the kernels' view of it, made once per model object. */
  private prepared(model: HmmModel): { message: ModelMessage; chain: SparseChain } {
    if (this.last?.model !== model) this.last = { model, message: modelMessage(model, ++this.version), chain: chainFromModel(model) };
    return this.last;
  }
}
