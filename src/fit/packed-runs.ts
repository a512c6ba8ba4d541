import type { MoveSteps } from '../kernels/move-chain.js';

/**
 * All runs' reading codes in one Int32Array (in a SharedArrayBuffer when workers are used, so every
 * worker reads the same memory without copies): run r is `obs[offsets[r] … offsets[r+1]-1]`.
 */
export interface PackedRuns {
  ids: string[];
  offsets: Int32Array;
  obs: Int32Array;
  /**
   * Odometry bins of every step (`MoveSteps`, same offsets as `obs`), present when the runs carry
   * movement columns: distance bin and heading bin, −1 = unknown.
   */
  dBin?: Int32Array;
  hBin?: Int32Array;
}

/** The odometry bins of packed run r (`packed.dBin`/`hBin` must be present). */
export function moveStepsOf(packed: PackedRuns, r: number): MoveSteps {
  return { dBin: packed.dBin!.subarray(packed.offsets[r], packed.offsets[r + 1]), hBin: packed.hBin!.subarray(packed.offsets[r], packed.offsets[r + 1]) };
}

export function packRuns(runs: ReadonlyArray<{ id: string; obs: Int32Array; moves?: MoveSteps }>, shared = false): PackedRuns {
  const offsets = new Int32Array(runs.length + 1);
  for (let r = 0; r < runs.length; r++) offsets[r + 1] = offsets[r] + runs[r].obs.length;
  const total = offsets[runs.length];
  const obs = shared ? new Int32Array(new SharedArrayBuffer(Math.max(4, total * 4)), 0, total) : new Int32Array(total);
  for (let r = 0; r < runs.length; r++) obs.set(runs[r].obs, offsets[r]);
  const packed: PackedRuns = { ids: runs.map((r) => r.id), offsets, obs };
  if (runs.some((r) => r.moves)) {
    const ints = (): Int32Array => (shared ? new Int32Array(new SharedArrayBuffer(Math.max(4, total * 4)), 0, total) : new Int32Array(total)).fill(-1);
    packed.dBin = ints();
    packed.hBin = ints();
    for (let r = 0; r < runs.length; r++) {
      const m = runs[r].moves;
      if (!m) continue;
      packed.dBin.set(m.dBin, offsets[r]);
      packed.hBin.set(m.hBin, offsets[r]);
    }
  }
  return packed;
}
