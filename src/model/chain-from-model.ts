import { linkBearings } from './link-bearings.js';
import { moveChainFromModel } from './move-chain-from-model.js';
import type { SparseChain } from '../kernels/sparse-chain.js';
import type { HmmModel, MovementParams } from './hmm-model.js';

/**
 * The kernels' typed-array view of a model: CSC copy of the transitions, the dwell/link split of both
 * orders (see `SparseChain`), transposed emissions with a row of ones for dropouts.
 */
export function chainFromModel(
  model: Pick<HmmModel, 'surfaces' | 'structure' | 'start' | 'trans' | 'emission'> & {
    movement?: MovementParams;
    cells?: HmmModel['cells'];
    /** Link bearings (`linkBearings`), when the model comes without its cells (a worker's copy). */
    linkBearing?: Float64Array;
  },
): SparseChain {
  const s = model.structure;
  const n = s.nCells;
  const m = model.surfaces.length;
  const predProb = new Float64Array(s.nnz);
  for (let p = 0; p < s.nnz; p++) predProb[p] = model.trans[s.predToSucc[p]];
  const emitT = new Float64Array((m + 1) * n);
  for (let i = 0; i < n; i++) for (let r = 0; r < m; r++) emitT[r * n + i] = model.emission[i * m + r];
  emitT.fill(1, m * n);

  // Dwell/link split. Found from the indices (not `structure.dwellPos`) so that any structure works.
  const dwell = new Float64Array(n);
  const dwellPos = new Int32Array(n).fill(-1);
  let nDwell = 0;
  for (let i = 0; i < n; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      if (s.succIdx[k] === i) {
        dwell[i] = model.trans[k];
        dwellPos[i] = k;
        nDwell++;
      }
    }
  }
  const nLinks = s.nnz - nDwell;
  const outPtr = new Int32Array(n + 1);
  const outIdx = new Int32Array(nLinks);
  const outProb = new Float64Array(nLinks);
  const outPos = new Int32Array(nLinks);
  let q = 0;
  for (let i = 0; i < n; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      if (s.succIdx[k] === i) continue;
      outIdx[q] = s.succIdx[k];
      outProb[q] = model.trans[k];
      outPos[q] = k;
      q++;
    }
    outPtr[i + 1] = q;
  }
  const inPtr = new Int32Array(n + 1);
  const inIdx = new Int32Array(nLinks);
  const inProb = new Float64Array(nLinks);
  q = 0;
  for (let j = 0; j < n; j++) {
    for (let p = s.predPtr[j]; p < s.predPtr[j + 1]; p++) {
      if (s.predIdx[p] === j) continue;
      inIdx[q] = s.predIdx[p];
      inProb[q] = predProb[p];
      q++;
    }
    inPtr[j + 1] = q;
  }
  const chain: SparseChain = {
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
    dwell,
    dwellPos,
    inPtr,
    inIdx,
    inProb,
    outPtr,
    outIdx,
    outProb,
    outPos,
  };
  if (model.movement) {
    const bearings = model.linkBearing ?? (model.cells ? linkBearings(s, model.cells) : undefined);
    if (!bearings) throw new RangeError('chainFromModel: a model with movement parameters needs its cells or link bearings');
    chain.move = moveChainFromModel(chain, model.movement, bearings);
  }
  return chain;
}
