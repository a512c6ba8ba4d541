/**
 * Steps per segment for a forward-backward pass over a run of `nSteps` steps whose table rows take
 * `rowBytes` bytes each: the whole run (one segment, nothing recomputed) when its table fits in
 * `limitBytes`, else ⌈√nSteps⌉ — checkpointed forward-backward: the forward vector is kept at the entry
 * of every segment and each segment's rows are recomputed from it on the way back, so memory grows as
 * √nSteps rows instead of nSteps, for one extra forward pass.
 */
export function segmentSteps(nSteps: number, rowBytes: number, limitBytes: number): number {
  if (nSteps <= 1 || (nSteps + 1) * rowBytes <= limitBytes) return Math.max(1, nSteps);
  return Math.ceil(Math.sqrt(nSteps));
}
