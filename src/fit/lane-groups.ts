import { LANES } from '../kernels/sparse-chain.js';

/**
 * Fewest runs worth a lane pass: with the WebAssembly lane kernels a pass of eight lanes costs about as
 * much as one and a half one-run passes (measured with bench/kernel-split.ts), so two runs already gain.
 */
export const MIN_LANE_RUNS = 2;

/**
 * How a block's runs are laid into lane groups: positions in the block (0 … runs.length-1), longest
 * run first (ties in block order), taken `LANES` at a time as long as a run is at least half as long as
 * its group's first — so the lanes of a group waste at most half their steps on padding. A group of
 * fewer than `MIN_LANE_RUNS` runs goes through the single-run kernels. Depends only on the block's run
 * lengths (not on the machine or the kernels in use), so every worker count gives the same groups.
 */
export function laneGroups(runs: ArrayLike<number>, offsets: Int32Array): number[][] {
  const length = (b: number): number => offsets[runs[b] + 1] - offsets[runs[b]];
  const order = Array.from({ length: runs.length }, (_, b) => b).sort((x, y) => length(y) - length(x) || x - y);
  const groups: number[][] = [];
  for (let k = 0; k < order.length; ) {
    const group = [order[k++]];
    const first = length(group[0]);
    while (k < order.length && group.length < LANES && 2 * length(order[k]) >= first) group.push(order[k++]);
    if (group.length >= MIN_LANE_RUNS) groups.push(group);
    else for (const b of group) groups.push([b]);
  }
  return groups;
}
