/**
 * All runs' reading codes in one Int32Array (in a SharedArrayBuffer when workers are used, so every
 * worker reads the same memory without copies): run r is `obs[offsets[r] … offsets[r+1]-1]`.
 */
export interface PackedRuns {
  ids: string[];
  offsets: Int32Array;
  obs: Int32Array;
}

export function packRuns(runs: ReadonlyArray<{ id: string; obs: Int32Array }>, shared = false): PackedRuns {
  const offsets = new Int32Array(runs.length + 1);
  for (let r = 0; r < runs.length; r++) offsets[r + 1] = offsets[r] + runs[r].obs.length;
  const total = offsets[runs.length];
  const obs = shared ? new Int32Array(new SharedArrayBuffer(Math.max(4, total * 4)), 0, total) : new Int32Array(total);
  for (let r = 0; r < runs.length; r++) obs.set(runs[r].obs, offsets[r]);
  return { ids: runs.map((r) => r.id), offsets, obs };
}
