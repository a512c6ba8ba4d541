import type { SparseChain } from '../kernels/sparse-chain.js';
import type { LaneAccumulators } from '../kernels/lane-kernels.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';

/**
 * Adds a run's (or lane group's) accumulators into `counts` and zeroes them for the next one: start
 * counts, reading counts (dropping the dropout row) and dwell counts at each dwell's CSR position; then
 * either per-link counts at each link's position (`perLink`), or — the totals form of
 * `backwardTotalsLanes` — each cell's link total at its first link's position, found as its γ summed over
 * all steps (every row of `emitCount`, dropouts included) less γ at the runs' last steps (`lastGamma`)
 * less its dwell count. See `ExpectedCountsTable.trans`.
 */
export function foldCounts(chain: SparseChain, acc: LaneAccumulators, counts: ExpectedCountsTable, perLink: boolean): void {
  const { nCells: n, nReadings: m, dwellPos, outPtr, outPos } = chain;
  const emit = acc.emitCount;
  const trans = counts.trans;
  for (let i = 0; i < n; i++) counts.start[i] += acc.startCount[i];
  acc.startCount.fill(0, 0, n);
  for (let i = 0; i < n; i++) if (dwellPos[i] >= 0) trans[dwellPos[i]] += acc.dwellCount[i];
  if (perLink) {
    const nLinks = outPtr[n];
    for (let q = 0; q < nLinks; q++) trans[outPos[q]] += acc.linkCount[q];
    acc.linkCount.fill(0, 0, nLinks);
  } else {
    for (let i = 0; i < n; i++) {
      if (outPtr[i + 1] === outPtr[i]) continue;
      let total = 0;
      for (let r = 0; r <= m; r++) total += emit[r * n + i];
      trans[outPos[outPtr[i]]] += total - acc.lastGamma[i] - acc.dwellCount[i];
    }
    acc.lastGamma.fill(0, 0, n);
  }
  acc.dwellCount.fill(0, 0, n);
  for (let x = 0; x < m * n; x++) counts.emitT[x] += emit[x];
  emit.fill(0, 0, (m + 1) * n);
}
