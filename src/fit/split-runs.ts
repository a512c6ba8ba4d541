import { SeededRandom } from '../model/seeded-random.js';

export interface RunSplit {
  /** Indices of the runs EM is fitted on, ascending. */
  fit: number[];
  /** Indices of the held-out runs, ascending. */
  heldOut: number[];
}

/**
 * Splits runs into fitted and held-out, by whole runs: either as flagged (`heldOutFlags[r]` true for a
 * run marked `held-out`), or a seeded random fraction `holdout` of the runs — rounded to the nearest
 * whole run, at least one when the fraction is positive and there are two or more runs, and never all.
 */
export function splitRuns(nRuns: number, holdout: number, seed: number, heldOutFlags?: ReadonlyArray<boolean>): RunSplit {
  const held = new Array<boolean>(nRuns).fill(false);
  if (heldOutFlags) {
    for (let r = 0; r < nRuns; r++) held[r] = heldOutFlags[r];
  } else if (holdout > 0 && nRuns >= 2) {
    const k = Math.min(nRuns - 1, Math.max(1, Math.round(holdout * nRuns)));
    const order = Array.from({ length: nRuns }, (_, r) => r);
    const rng = new SeededRandom(seed ^ 0x68e31da4);
    for (let i = nRuns - 1; i > 0; i--) {
      const j = rng.int(i + 1);
      [order[i], order[j]] = [order[j], order[i]];
    }
    for (let i = 0; i < k; i++) held[order[i]] = true;
  }
  const fit: number[] = [];
  const heldOut: number[] = [];
  for (let r = 0; r < nRuns; r++) (held[r] ? heldOut : fit).push(r);
  return { fit, heldOut };
}
