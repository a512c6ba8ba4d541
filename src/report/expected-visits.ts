import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { scoreRun } from '../decode/score-run.js';
import { emIteration, type RunReadings } from '../fit/em-iteration.js';

export interface ExpectedVisits {
  /** Expected readings per cell under the model: Σ_t γ_t(i) over non-dropout steps. */
  readings: Float64Array;
  /** Runs left out because they are impossible under the model. */
  impossibleRuns: string[];
}

/**
 * Expected readings per cell over `runs` under `model`: the E-step's reading counts (one Baum-Welch
 * E-step, `emIteration`), summed over readings. Their shares are where the robots spent their
 * readings, as far as the model can tell. Runs impossible under the model are left out and named.
 */
export function expectedVisits(model: HmmModel, runs: ReadonlyArray<RunReadings>): ExpectedVisits {
  const chain = chainFromModel(model);
  const work = new Float64Array(2 * chain.nCells);
  const possible: RunReadings[] = [];
  const impossibleRuns: string[] = [];
  for (const run of runs) {
    if (scoreRun(chain, run.obs, work) === -Infinity) impossibleRuns.push(run.id);
    else possible.push(run);
  }
  const n = chain.nCells;
  const m = chain.nReadings;
  const readings = new Float64Array(n);
  if (possible.length === 0) return { readings, impossibleRuns };
  // Only the E-step's counts are used; the cheapest M-step (fixed transitions, no prior) goes with them.
  const { counts } = emIteration(model, possible, { mode: 'fixed', priorStrength: 0 });
  for (let r = 0; r < m; r++) for (let i = 0; i < n; i++) readings[i] += counts.emitT[r * n + i];
  return { readings, impossibleRuns };
}
