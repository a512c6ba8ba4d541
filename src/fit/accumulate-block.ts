import { accumulateMoveLanes } from './accumulate-move-lanes.js';
import { LANES, type SparseChain } from '../kernels/sparse-chain.js';
import { forwardScore } from '../kernels/forward-score.js';
import { emptyCounts, type ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { TransitionMode } from '../model/hmm-model.js';
import { addRunCounts } from './add-run-counts.js';
import { accumulateLanes } from './accumulate-lanes.js';
import type { EStepWorkspace } from './e-step-workspace.js';
import { moveStepsOf, type PackedRuns } from './packed-runs.js';
import { addMoveRunCounts } from './add-move-run-counts.js';
import { laneGroups } from './lane-groups.js';
import { addPrunedRunCounts } from './add-pruned-run-counts.js';

export interface BlockCounts {
  counts: ExpectedCountsTable;
  /** Index (into the packed runs) of a run impossible under the model, or −1. */
  impossibleRun: number;
}

/**
 * Expected counts of one block of runs into fresh accumulators. Runs of similar length go through the
 * lane kernels `LANES` at a time (see `laneGroups`), a run left alone through the single-run kernels;
 * the log-likelihoods are added in block order. The grouping depends only on the block, and the same
 * function runs in-process and in workers, so a block's sums are bit-identical wherever it runs.
 *
 * `mode` is the M-step the counts are for: `learned` needs one transition count per link; `tied` and
 * `fixed` only each row's dwell and link totals, which the lane kernels then compute at a cost per cell
 * instead of per link (see `ExpectedCountsTable.trans`). When a run is impossible, `impossibleRun` names
 * the first such run in block order and the counts are incomplete.
 *
 * `prune` > 0 (`fit --prune`, runs without odometry only) runs every run through the pruned E-step
 * (`addPrunedRunCounts`); 0 leaves everything above exactly as it was.
 */
export function accumulateBlock(
  chain: SparseChain,
  packed: PackedRuns,
  runs: ArrayLike<number>,
  ws: EStepWorkspace,
  mode: TransitionMode = 'learned',
  prune = 0,
): BlockCounts {
  const withMove = chain.move !== undefined && packed.dBin !== undefined;
  const counts = emptyCounts(chain.nCells, chain.nnz, chain.nReadings, withMove);
  const obsOf = (r: number): Int32Array => packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]);
  const logs = new Float64Array(runs.length);
  if (withMove) {
    // Runs with odometry (per-step transitions): lane groups through the movement lane kernels for the
    // `tied`/`fixed` M-steps (totals form), a run left alone — or every run for `learned`, which needs
    // per-link counts — through the single-run movement kernels.
    const laneLogs = new Float64Array(LANES);
    for (const members of mode === 'learned' ? Array.from({ length: runs.length }, (_, b) => [b]) : laneGroups(runs, packed.offsets)) {
      if (members.length === 1) {
        const b = members[0];
        logs[b] = addMoveRunCounts(chain, obsOf(runs[b]), moveStepsOf(packed, runs[b]), counts, counts.move!, ws);
        if (logs[b] === -Infinity) return { counts, impossibleRun: runs[b] };
        continue;
      }
      if (!accumulateMoveLanes(chain, packed, members.map((b) => runs[b]), counts, ws, laneLogs)) {
        return { counts, impossibleRun: runs[members[laneLogs.findIndex((x, k) => k < members.length && x === -Infinity)]] };
      }
      members.forEach((b, k) => (logs[b] = laneLogs[k]));
    }
    for (let b = 0; b < runs.length; b++) {
      counts.logLik += logs[b];
      counts.nReadings += countReadings(obsOf(runs[b]));
      counts.nRuns += 1;
    }
    return { counts, impossibleRun: -1 };
  }
  if (prune > 0) {
    // `fit --prune`: every run through the pruned single-run kernels (lanes would have to keep the
    // union of their runs' cells); the counts are per link, which every M-step reads.
    for (let b = 0; b < runs.length; b++) {
      logs[b] = addPrunedRunCounts(chain, obsOf(runs[b]), counts, ws, prune);
      if (logs[b] === -Infinity) return { counts, impossibleRun: firstImpossible(chain, runs, obsOf) };
    }
  }
  const laneLogs = new Float64Array(LANES);
  const perLink = mode === 'learned';
  for (const members of prune > 0 ? [] : laneGroups(runs, packed.offsets)) {
    if (members.length === 1) {
      const b = members[0];
      logs[b] = addRunCounts(chain, obsOf(runs[b]), counts, ws);
      if (logs[b] === -Infinity) return { counts, impossibleRun: firstImpossible(chain, runs, obsOf) };
      continue;
    }
    const ok = accumulateLanes(chain, members.map((b) => obsOf(runs[b])), counts, ws, perLink, laneLogs);
    if (!ok) return { counts, impossibleRun: firstImpossible(chain, runs, obsOf) };
    members.forEach((b, k) => (logs[b] = laneLogs[k]));
  }
  for (let b = 0; b < runs.length; b++) {
    counts.logLik += logs[b];
    counts.nReadings += countReadings(obsOf(runs[b]));
    counts.nRuns += 1;
  }
  return { counts, impossibleRun: -1 };
}

function countReadings(obs: Int32Array): number {
  let k = 0;
  for (let t = 0; t < obs.length; t++) if (obs[t] >= 0) k++;
  return k;
}

/** The first run of the block, in block order, that is impossible under the model. */
function firstImpossible(chain: SparseChain, runs: ArrayLike<number>, obsOf: (r: number) => Int32Array): number {
  const work = new Float64Array(2 * chain.nCells);
  for (let b = 0; b < runs.length; b++) {
    const obs = obsOf(runs[b]);
    if (forwardScore(chain, obs, obs.length, work) === -Infinity) return runs[b];
  }
  return runs[0];
}
