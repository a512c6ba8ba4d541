/**
 * Measures `compare`'s statistical behaviour and cost on simulated refurbishments (not part of
 * `npm test`; the figures are in DEVELOPERS.md, "compare"). Floors, refurbishments and the trial are
 * in bench/refurbishment-trial.ts: compare's own search, null draws, regions and tests. Prints, by kind:
 *
 * - the false-discovery proportion by region (a reported region holding no changed cell is false),
 *   mean over trials with a report, at a nominal FDR of 0.05;
 * - the share of changed cells with ≥ 300 expected readings that lie inside a reported region;
 * - how many cells the reported regions hold beyond the changed ones (mean per reported region, and
 *   the largest region);
 * - cells `--write-floor` would write that did not change;
 * - decoding of the new runs (Viterbi) by the re-fitted model and by the true new model: share of
 *   steps within 1.5 m of the true cell, and in the true cell's zone;
 * - cost: compare's time (the re-fit search and the null draws) over the time of `fit` with as many
 *   restarts as the search has candidate starts, on the same new runs, in this process (one worker).
 *
 *   npm run build && node dist/bench/compare-fdr.js [seeds] [nullDraws]
 *
 * `FLOOR=offices|stripes` (default offices). `REACH=` and `LOOKALIKE=` set the regions' reach (links)
 * and look-alike threshold (total variation); `REACH=0 LOOKALIKE=-1` makes every cell its own region.
 * `NULL_SEARCH=full` runs the whole search on every null draw (compare's draws: warm start and swaps).
 * `STARTS=none` leaves out the re-fit's fresh starts (survey, sensor). `KINDS=room,none` runs only those kinds. `DEBUG=1` prints every trial.
 */
import { DEFAULT_REGION_OPTIONS } from '../src/compare/build-regions.js';
import { DEFAULT_REFIT_SEARCH } from '../src/compare/search-refit.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../src/fit/fit-model.js';
import { benchBuilding, decodeShare, refurbishmentTrial, REFURBISHMENT_KINDS, TRIAL_LOOP, type BenchFloor } from './refurbishment-trial.js';

const nSeeds = Number(process.argv[2] ?? 3);
const nullDraws = Number(process.argv[3] ?? 10);
const layout = (process.env.FLOOR ?? 'offices') as BenchFloor;
const regions = { ...DEFAULT_REGION_OPTIONS, ...(process.env.REACH ? { reach: Number(process.env.REACH) } : {}), ...(process.env.LOOKALIKE ? { lookAlikeTv: Number(process.env.LOOKALIKE) } : {}) };
const search = { ...DEFAULT_REFIT_SEARCH, ...(process.env.STARTS === 'none' ? { starts: [] } : {}) };
const nullSearch = process.env.NULL_SEARCH === 'full' ? 'full' : 'warm';
const building = benchBuilding(layout);
const { floor } = building;
const restarts = 1 + search.robust.length + search.starts.length;

const seeds = Array.from({ length: nSeeds }, (_, s) => 101 + 7 * s);
console.log(`compare on simulated refurbishments (${layout} floor, ${floor.cells.length} cells): ${nSeeds} seeds per kind, 30 new runs of 300 steps, ${nullDraws} null draws (${nullSearch} search), ${restarts} candidate starts`);
console.log(
  ['kind', 'trials', 'reported', 'FDP by region', 'found (≥300 readings)', 'extra per region (max)', 'written unchanged', 'decode 1.5 m / zone: re-fit', 'true new model', 'compare ÷ fit'].join(' | '),
);
for (const kind of REFURBISHMENT_KINDS.filter((k) => !process.env.KINDS || process.env.KINDS.split(',').includes(k))) {
  let fdp = 0, withReport = 0, reported = 0, testable = 0, found = 0, extra = 0, maxExtra = 0, writtenUnchanged = 0, compareSeconds = 0, fitSeconds = 0;
  const dec = { rn: 0, rz: 0, tn: 0, tz: 0 };
  for (const seed of seeds) {
    const t = await refurbishmentTrial(building, seed, kind, { nullDraws, regions, search, nullSearch });
    if (t.reported) {
      withReport++;
      fdp += t.falseRegions / t.reported;
    }
    reported += t.reported;
    testable += t.testable;
    found += t.found;
    extra += t.extra.reduce((a, b) => a + b, 0);
    maxExtra = Math.max(maxExtra, ...t.extra, 0);
    writtenUnchanged += t.writtenUnchanged.length;
    const r = decodeShare(floor, t.refit, t.newRuns);
    const tr = decodeShare(floor, t.after, t.newRuns);
    dec.rn += r.near / nSeeds;
    dec.rz += r.zone / nSeeds;
    dec.tn += tr.near / nSeeds;
    dec.tz += tr.zone / nSeeds;
    compareSeconds += t.seconds.search + t.seconds.draws;
    const f0 = performance.now();
    await fitModel({ floor, runs: t.newRuns, floorDigest: '', runsDigests: [] }, { ...DEFAULT_FIT_OPTIONS, transitions: 'fixed', dwell: 0.6, restarts, maxIter: TRIAL_LOOP.maxIter, tol: TRIAL_LOOP.tol }, 1);
    fitSeconds += (performance.now() - f0) / 1000;
    if (process.env.DEBUG) {
      console.log(`seed ${seed} ${kind}: changed ${[...t.changed].map((i) => floor.cells[i].id).join(';') || '-'}; re-fit ${(100 * r.near).toFixed(1)} % vs ${(100 * tr.near).toFixed(1)} %; written ${[...t.written].map(([c, s]) => `${c}→${s}`).join(' ') || '-'}`);
      for (const g of t.comparison.regions.filter((x) => x.verdict === 'changed')) console.log(`  ${g.region} q=${g.qValue?.toExponential(1)} ${g.cells.join(';')}`);
    }
  }
  console.log(
    [
      kind,
      nSeeds,
      reported,
      withReport ? (fdp / withReport).toFixed(3) : '–',
      testable ? `${found} of ${testable}` : '–',
      reported ? `${(extra / reported).toFixed(1)} (${maxExtra})` : '–',
      writtenUnchanged,
      `${(100 * dec.rn).toFixed(1)} % / ${(100 * dec.rz).toFixed(1)} %`,
      `${(100 * dec.tn).toFixed(1)} % / ${(100 * dec.tz).toFixed(1)} %`,
      `${(compareSeconds / fitSeconds).toFixed(2)} (${compareSeconds.toFixed(1)} s / ${fitSeconds.toFixed(1)} s)`,
    ].join(' | '),
  );
}
