import type { SparseChain } from '../kernels/sparse-chain.js';
import { DISTANCE_BINS, DISTANCE_BIN_METRES, HEADING_BINS, HEADING_BIN_DEGREES, type MoveChain } from '../kernels/move-chain.js';
import type { MovementParams } from './hmm-model.js';

/**
 * The kernels' per-step transition tables (`MoveChain`) for a chain and its movement parameters:
 * s(d) = σ(stayLogit − stayPerMetre · d) at every distance bin (d = bin · 1 cm); for every heading bin
 * (centre h) and cell i, its links' split a_ij / (1 − a_ii) times exp(κ cos(h − θ_ij)) (weight 1 for a
 * link without a bearing, `bearings` NaN), normalised over the cell's links; the last row is the plain
 * split. `bearings` is `linkBearings` (the chain's `out` order).
 */
export function moveChainFromModel(chain: SparseChain, params: MovementParams, bearings: Float64Array): MoveChain {
  const { nCells: n, dwell, outPtr, outProb, inPtr, inIdx } = chain;
  const nLinks = outPtr[n];
  if (bearings.length !== nLinks) throw new RangeError(`moveChainFromModel: bearings must have ${nLinks} entries, got ${bearings.length}`);
  const stayByDistance = new Float64Array(DISTANCE_BINS);
  for (let b = 0; b < DISTANCE_BINS; b++) stayByDistance[b] = logistic(params.stayLogit - params.stayPerMetre * b * DISTANCE_BIN_METRES);
  const eligible = new Uint8Array(n);
  for (let i = 0; i < n; i++) eligible[i] = dwell[i] > 0 && dwell[i] < 1 ? 1 : 0;
  const rows = HEADING_BINS + 1;
  const splitOut = new Float64Array(rows * nLinks);
  const kappa = params.kappa;
  for (let b = 0; b < rows; b++) {
    const h = ((b + 0.5) * HEADING_BIN_DEGREES * Math.PI) / 180;
    const off = b * nLinks;
    for (let i = 0; i < n; i++) {
      let total = 0;
      for (let q = outPtr[i]; q < outPtr[i + 1]; q++) {
        const c = b === HEADING_BINS || Number.isNaN(bearings[q]) ? 0 : Math.cos(h - bearings[q]);
        // exp(κ (c − 1)): the weights shifted by the largest possible, so that no weight overflows.
        const v = outProb[q] * Math.exp(kappa * (c - 1));
        splitOut[off + q] = v;
        total += v;
      }
      for (let q = outPtr[i]; q < outPtr[i + 1]; q++) splitOut[off + q] = total > 0 ? splitOut[off + q] / total : 0;
    }
  }
  // The same numbers in `in` order: `in` entry p is the link inIdx[p] → j; find its `out` position.
  const splitIn = new Float64Array(rows * nLinks);
  const inToOut = new Int32Array(nLinks);
  for (let j = 0; j < n; j++) {
    for (let p = inPtr[j]; p < inPtr[j + 1]; p++) {
      const i = inIdx[p];
      let q = outPtr[i];
      while (chain.outIdx[q] !== j) q++;
      inToOut[p] = q;
    }
  }
  for (let b = 0; b < rows; b++) {
    const off = b * nLinks;
    for (let p = 0; p < nLinks; p++) splitIn[off + p] = splitOut[off + inToOut[p]];
  }
  const linkCos = Float64Array.from(bearings, (b) => (Number.isNaN(b) ? 0 : Math.cos(b)));
  const linkSin = Float64Array.from(bearings, (b) => (Number.isNaN(b) ? 0 : Math.sin(b)));
  return { nHeadingBins: HEADING_BINS, stayByDistance, eligible, splitOut, splitIn, linkCos, linkSin };
}

export function logistic(x: number): number {
  return x >= 0 ? 1 / (1 + Math.exp(-x)) : Math.exp(x) / (1 + Math.exp(x));
}
