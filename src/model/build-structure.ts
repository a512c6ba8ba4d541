import type { TransitionStructure } from './hmm-model.js';

/**
 * Builds the sparse transition structure for `nCells` cells from directed edges `[from, to]` (indices),
 * adding every cell's dwell (self) transition. Duplicate edges are merged; self edges in the list are the
 * dwell. Rows (CSR) and columns (CSC) list indices in ascending order.
 */
export function buildStructure(nCells: number, edges: ReadonlyArray<readonly [number, number]>): TransitionStructure {
  const succSets: number[][] = Array.from({ length: nCells }, (_, i) => [i]);
  for (const [from, to] of edges) {
    if (!(from >= 0 && from < nCells && to >= 0 && to < nCells)) {
      throw new RangeError(`buildStructure: edge must join cells 0…${nCells - 1}, got [${from}, ${to}]`);
    }
    succSets[from].push(to);
  }
  const succPtr = new Int32Array(nCells + 1);
  const rows = succSets.map((s) => Array.from(new Set(s)).sort((a, b) => a - b));
  for (let i = 0; i < nCells; i++) succPtr[i + 1] = succPtr[i] + rows[i].length;
  const nnz = succPtr[nCells];
  const succIdx = new Int32Array(nnz);
  const dwellPos = new Int32Array(nCells);
  for (let i = 0; i < nCells; i++) {
    let k = succPtr[i];
    for (const j of rows[i]) {
      if (j === i) dwellPos[i] = k;
      succIdx[k++] = j;
    }
  }
  // CSC by counting sort over columns; visiting rows in ascending order keeps each column ascending.
  const predPtr = new Int32Array(nCells + 1);
  for (let k = 0; k < nnz; k++) predPtr[succIdx[k] + 1]++;
  for (let j = 0; j < nCells; j++) predPtr[j + 1] += predPtr[j];
  const fill = predPtr.slice(0, nCells);
  const predIdx = new Int32Array(nnz);
  const predToSucc = new Int32Array(nnz);
  for (let i = 0; i < nCells; i++) {
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) {
      const p = fill[succIdx[k]]++;
      predIdx[p] = i;
      predToSucc[p] = k;
    }
  }
  return { nCells, nnz, succPtr, succIdx, predPtr, predIdx, predToSucc, dwellPos };
}
