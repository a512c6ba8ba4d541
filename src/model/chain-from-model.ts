import type { SparseChain } from '../kernels/sparse-chain.js';
import type { HmmModel } from './hmm-model.js';

/** The kernels' typed-array view of a model: CSC copy of the transitions, transposed emissions with a row of ones for dropouts. */
export function chainFromModel(model: Pick<HmmModel, 'surfaces' | 'structure' | 'start' | 'trans' | 'emission'>): SparseChain {
  const s = model.structure;
  const n = s.nCells;
  const m = model.surfaces.length;
  const predProb = new Float64Array(s.nnz);
  for (let p = 0; p < s.nnz; p++) predProb[p] = model.trans[s.predToSucc[p]];
  const emitT = new Float64Array((m + 1) * n);
  for (let i = 0; i < n; i++) for (let r = 0; r < m; r++) emitT[r * n + i] = model.emission[i * m + r];
  emitT.fill(1, m * n);
  return {
    nCells: n,
    nReadings: m,
    nnz: s.nnz,
    start: model.start,
    succPtr: s.succPtr,
    succIdx: s.succIdx,
    succProb: model.trans,
    predPtr: s.predPtr,
    predIdx: s.predIdx,
    predProb,
    predToSucc: s.predToSucc,
    emitT,
  };
}
