/**
 * Calibration figures (DEVELOPERS.md, "Calibration"): on the two invented misspecified buildings
 * (`misspecified-building.ts`: per-cell dwells, unequal link weights, the truth known), fits every
 * transition mode and reports, on fresh runs from the truth, the log-likelihood per reading, the
 * expected calibration error of likely_p against the true cell, exact-cell and within-1.5 m accuracy,
 * and the fit's label-free predictive calibration error (held-out runs).
 *
 *   node dist/bench/calibration-figures.js [modes] [transition prior strengths] [restarts]
 *
 * `auto` gets `restarts`; each explicit mode a quarter of them (its share inside `auto`).
 *   node dist/bench/calibration-figures.js tied,per-cell,learned,fixed,auto 20 8
 *   node dist/bench/calibration-figures.js per-cell,learned 0,5,20,50,200 8     # choosing the default W
 */
import { fitModel, DEFAULT_FIT_OPTIONS } from '../src/fit/fit-model.js';
import type { FitTransitions } from '../src/fit/fit-record.js';
import { misspecifiedBuilding, MISSPECIFIED_SPECS } from './misspecified-building.js';
import { decodingCalibration } from './decoding-calibration.js';

const modes = (process.argv[2] ?? 'tied,per-cell,learned,fixed,auto').split(',') as FitTransitions[];
const strengths = (process.argv[3] ?? String(DEFAULT_FIT_OPTIONS.transitionPriorStrength)).split(',').map(Number);
const restarts = Number(process.argv[4] ?? 8);

const pad = (v: string | number, n: number): string => String(v).padStart(n);
console.log(['building', 'mode', 'W', 'chosen', 'test ll/reading', 'likely_p ECE', 'exact', 'within 1.5 m', 'predictive ECE', 'seconds'].join(' | '));
for (const [key, seed] of [['test', 7], ['small', 11]] as const) {
  const b = misspecifiedBuilding(MISSPECIFIED_SPECS[key], seed);
  const t = decodingCalibration(b.truth, b.testRuns, b.testPaths);
  console.log([key, 'truth', '', '', t.logLikPerReading.toFixed(4), t.ece.toFixed(3), t.exact.toFixed(3), t.within15.toFixed(3), '', ''].join(' | '));
  for (const mode of modes) {
    for (const w of mode === 'per-cell' || mode === 'learned' || mode === 'auto' ? strengths : [0]) {
      const t0 = Date.now();
      const { model, record } = await fitModel(
        { floor: b.floor, runs: b.runs, floorDigest: '', runsDigests: [] },
        { ...DEFAULT_FIT_OPTIONS, transitions: mode, transitionPriorStrength: w, restarts: mode === 'auto' ? restarts : Math.max(1, Math.round(restarts / 4)) },
        1,
      );
      const s = decodingCalibration(model, b.testRuns, b.testPaths);
      const chosen = record.restarts[record.selected].mode ?? mode;
      console.log(
        [key, mode, w, chosen, s.logLikPerReading.toFixed(4), s.ece.toFixed(3), s.exact.toFixed(3), s.within15.toFixed(3), record.predictiveCalibration?.ece.toFixed(4) ?? '—', pad(((Date.now() - t0) / 1000).toFixed(1), 5)].join(' | '),
      );
    }
  }
}
