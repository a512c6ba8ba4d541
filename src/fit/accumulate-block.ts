import type { SparseChain } from '../kernels/sparse-chain.js';
import { emptyCounts, type ExpectedCountsTable } from '../model/expected-counts-table.js';
import { accumulateRun } from './accumulate-run.js';
import { EStepWorkspace } from './e-step-workspace.js';
import type { PackedRuns } from './packed-runs.js';

export interface BlockCounts {
  counts: ExpectedCountsTable;
  /** Index (into the packed runs) of a run impossible under the model, or −1. */
  impossibleRun: number;
}

/**
 * Expected counts of one block of runs, summed in the block's order into fresh accumulators. The same
 * function runs in-process and in workers, so a block's sums are bit-identical wherever it runs.
 */
export function accumulateBlock(chain: SparseChain, packed: PackedRuns, runs: ArrayLike<number>, ws: EStepWorkspace): BlockCounts {
  const counts = emptyCounts(chain.nCells, chain.nnz, chain.nReadings);
  for (let b = 0; b < runs.length; b++) {
    const r = runs[b];
    const obs = packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]);
    if (accumulateRun(chain, obs, counts, ws) === -Infinity) return { counts, impossibleRun: r };
  }
  return { counts, impossibleRun: -1 };
}
