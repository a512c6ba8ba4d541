import { chainFromModel } from '../model/chain-from-model.js';
import type { HmmModel } from '../model/hmm-model.js';
import { accumulateBlock, type BlockCounts } from './accumulate-block.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { EStepEngine } from './e-step-engine.js';
import type { PackedRuns } from './packed-runs.js';
import { scoreBlock, type BlockScore } from './score-block.js';

/** The E-step engine that works in this thread (`--workers 1`). */
export class LocalEngine implements EStepEngine {
  readonly workers = 1;
  private readonly ws = new EStepWorkspace();

  constructor(private readonly packed: PackedRuns) {}

  async counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]> {
    const chain = chainFromModel(model);
    return blocks.map((b) => accumulateBlock(chain, this.packed, b, this.ws));
  }

  async score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]> {
    const chain = chainFromModel(model);
    const work = new Float64Array(2 * chain.nCells);
    return blocks.map((b) => scoreBlock(chain, this.packed, b, work));
  }

  async close(): Promise<void> {}
}
