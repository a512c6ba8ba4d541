import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardScore } from '../kernels/forward-score.js';
import type { PackedRuns } from './packed-runs.js';

export interface BlockScore {
  logLik: number;
  nReadings: number;
  /** Index (into the packed runs) of a run impossible under the model, or −1. */
  impossibleRun: number;
}

/** Σ log P(readings) of one block of runs (forward only, O(cells) memory per run), in the block's order. */
export function scoreBlock(chain: SparseChain, packed: PackedRuns, runs: ArrayLike<number>, work: Float64Array): BlockScore {
  let logLik = 0;
  let nReadings = 0;
  for (let b = 0; b < runs.length; b++) {
    const r = runs[b];
    const a = packed.offsets[r];
    const z = packed.offsets[r + 1];
    const obs = packed.obs.subarray(a, z);
    const logP = forwardScore(chain, obs, z - a, work);
    if (logP === -Infinity) return { logLik: -Infinity, nReadings, impossibleRun: r };
    logLik += logP;
    for (let t = a; t < z; t++) if (packed.obs[t] >= 0) nReadings++;
  }
  return { logLik, nReadings, impossibleRun: -1 };
}
