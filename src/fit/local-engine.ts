import { chainFromModel } from '../model/chain-from-model.js';
import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { EStepEngine } from './e-step-engine.js';
import type { PackedRuns } from './packed-runs.js';
import { scoreBlock, type BlockScore } from './score-block.js';

export interface EngineOptions {
  /**
   * The M-step the counts are for: `learned` needs per-link transition counts; `tied` and `fixed` only
   * row totals, which are cheaper (see `accumulateBlock`). @default 'learned' (counts fit for every mode)
   */
  mode?: TransitionMode;
  /** `fit --prune`: the pruned E-step's discarded share per step (0 = exact). @default 0 */
  prune?: number;
}

/** The E-step engine that works in this thread (`--workers 1`). */
export class LocalEngine implements EStepEngine {
  readonly workers = 1;
  private readonly ws = new EStepWorkspace();
  private readonly mode: TransitionMode;
  private readonly prune: number;

  constructor(
    private readonly packed: PackedRuns,
    options: EngineOptions = {},
  ) {
    this.mode = options.mode ?? 'learned';
    this.prune = options.prune ?? 0;
  }

  async counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]> {
    const chain = chainFromModel(model);
    return blocks.map((b) => accumulateBlock(chain, this.packed, b, this.ws, this.mode, this.prune));
  }

  async score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]> {
    const chain = chainFromModel(model);
    return blocks.map((b) => scoreBlock(chain, this.packed, b, this.ws));
  }

  async close(): Promise<void> {}
}
