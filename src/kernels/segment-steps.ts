/**
 * Steps per segment for a forward-backward pass over a run of `nSteps` steps whose table rows take
 * `rowBytes` bytes each: the whole run (one segment, nothing recomputed) when its table fits in
 * `limitBytes`; else checkpointed forward-backward — the forward vector is kept at the entry of every
 * segment and each segment's rows but the last are recomputed from it on the way back — with segments
 * as long as the limit allows (the longer they are, the less is recomputed: a share 1 − segment/steps
 * of one forward pass), but never shorter than ⌈√nSteps⌉, the length that minimises table plus
 * checkpoints. Memory is then about max(limit, 2 √nSteps rows) instead of nSteps rows.
 */
export function segmentSteps(nSteps: number, rowBytes: number, limitBytes: number): number {
  if (nSteps <= 1 || (nSteps + 1) * rowBytes <= limitBytes) return Math.max(1, nSteps);
  const fit = Math.floor(limitBytes / rowBytes) - 1;
  return Math.min(nSteps, Math.max(Math.ceil(Math.sqrt(nSteps)), fit));
}
