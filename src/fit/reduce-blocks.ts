import type { HmmModel } from '../model/hmm-model.js';
import { emptyCounts, type ExpectedCountsTable } from '../model/expected-counts-table.js';
import { addCounts } from '../model/add-counts.js';
import type { PackedRuns } from './packed-runs.js';
import { impossibleRunError } from './impossible-run-error.js';
import { checkFiniteCounts } from './check-finite-counts.js';

/** Sums per-block counts in block order; names the run if one was impossible. */
export function reduceBlocks(model: HmmModel, packed: PackedRuns, blockCounts: ReadonlyArray<{ counts: ExpectedCountsTable; impossibleRun: number }>): ExpectedCountsTable {
  const s = model.structure;
  const total = emptyCounts(s.nCells, s.nnz, model.surfaces.length, blockCounts.some((b) => b.counts.move));
  for (const b of blockCounts) {
    if (b.impossibleRun >= 0) {
      const r = b.impossibleRun;
      throw impossibleRunError(model, { id: packed.ids[r], obs: packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]) });
    }
    addCounts(total, b.counts);
  }
  checkFiniteCounts(model, total);
  return total;
}
