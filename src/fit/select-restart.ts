import type { LoopRecord } from './fit-record.js';

/**
 * The restart to keep: the best held-out log-likelihood per reading when runs were held out, else the
 * best final training objective per reading. Ties go to the lower index.
 */
export function selectRestart(restarts: ReadonlyArray<LoopRecord>, byHeldOut: boolean): number {
  const score = (r: LoopRecord): number => (byHeldOut ? (r.heldOutLogLikPerReading ?? -Infinity) : r.history[r.history.length - 1]);
  let best = 0;
  for (let k = 1; k < restarts.length; k++) if (score(restarts[k]) > score(restarts[best])) best = k;
  return best;
}
