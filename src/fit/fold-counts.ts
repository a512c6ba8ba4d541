import type { SparseChain } from '../kernels/sparse-chain.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { EStepWorkspace } from './e-step-workspace.js';

/**
 * Adds the workspace's per-run (or per-group) accumulators into `counts` and zeroes them for the next
 * one: reading counts (dropping the dropout row) and dwell counts at each dwell's CSR position; then
 * either per-link counts at each link's position (`perLink`), or — for the totals form of
 * `backwardTotalsLanes` — each cell's link total at its first link's position, found as its γ summed
 * over all steps (every row of `emitCount`, dropouts included) less γ at the runs' last steps
 * (`lastGamma`) less its dwell count. See `ExpectedCountsTable.trans`.
 */
export function foldCounts(chain: SparseChain, ws: EStepWorkspace, counts: ExpectedCountsTable, perLink: boolean): void {
  const { nCells: n, nReadings: m, dwellPos, outPtr, outPos } = chain;
  const emit = ws.emitCount;
  const trans = counts.trans;
  for (let i = 0; i < n; i++) if (dwellPos[i] >= 0) trans[dwellPos[i]] += ws.dwellCount[i];
  if (perLink) {
    const nLinks = outPtr[n];
    for (let q = 0; q < nLinks; q++) trans[outPos[q]] += ws.linkCount[q];
    ws.linkCount.fill(0, 0, nLinks);
  } else {
    for (let i = 0; i < n; i++) {
      if (outPtr[i + 1] === outPtr[i]) continue;
      let total = 0;
      for (let r = 0; r <= m; r++) total += emit[r * n + i];
      trans[outPos[outPtr[i]]] += total - ws.lastGamma[i] - ws.dwellCount[i];
    }
    ws.lastGamma.fill(0, 0, n);
  }
  ws.dwellCount.fill(0, 0, n);
  for (let x = 0; x < m * n; x++) counts.emitT[x] += emit[x];
  emit.fill(0, 0, (m + 1) * n);
}
