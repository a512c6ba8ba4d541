import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import type { BlockCounts } from './accumulate-block.js';
import type { EStepEngine } from './e-step-engine.js';
import type { EngineOptions } from './local-engine.js';
import { modelMessage, type ModelMessage } from './model-message.js';
import type { PackedRuns } from './packed-runs.js';
import type { BlockScore } from './score-block.js';
import type { WorkerTask } from './e-step-worker.js';

/**
 * The E-step engine over `workers` worker threads (piscina). Each block is one task; results are
 * returned in block order whatever order the workers finish in. The runs must be packed into shared
 * memory (`packRuns(runs, true)`), so workers read them without copies; each model is copied once into
 * shared memory (`modelMessage`), so a task carries only references.
 */
export class PoolEngine implements EStepEngine {
  private readonly pool: Piscina;
  private readonly mode: TransitionMode;
  private last: { model: HmmModel; message: ModelMessage } | null = null;
  private version = 0;

  constructor(
    packed: PackedRuns,
    readonly workers: number,
    options: EngineOptions = {},
  ) {
    this.mode = options.mode ?? 'learned';
    // Under tsx/vitest this file is TypeScript: the worker needs the tsx loader (see STACK.md).
    const ts = import.meta.url.endsWith('.ts');
    this.pool = new Piscina({
      filename: fileURLToPath(new URL(`./e-step-worker.${ts ? 'ts' : 'js'}`, import.meta.url)),
      minThreads: workers,
      maxThreads: workers,
      idleTimeout: 60_000,
      workerData: { packed },
      execArgv: ts ? ['--import', 'tsx'] : [],
    });
  }

  counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]> {
    const message = this.messageOf(model);
    return Promise.all(blocks.map((block) => this.pool.run({ kind: 'counts', model: message, block, mode: this.mode } satisfies WorkerTask) as Promise<BlockCounts>));
  }

  score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]> {
    const message = this.messageOf(model);
    return Promise.all(blocks.map((block) => this.pool.run({ kind: 'score', model: message, block, mode: this.mode } satisfies WorkerTask) as Promise<BlockScore>));
  }

  async close(): Promise<void> {
    await this.pool.destroy();
  }

  /** The shared-memory copy of `model`, made once per model object. */
  private messageOf(model: HmmModel): ModelMessage {
    if (this.last?.model !== model) this.last = { model, message: modelMessage(model, ++this.version) };
    return this.last.message;
  }
}
