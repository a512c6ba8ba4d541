/**
 * Measures `compare`'s statistical behaviour on simulated refurbishments (not part of `npm test`: the
 * method does not yet meet its targets — see DEVELOPERS.md, "compare"). Prints, over repeated seeds,
 * the mean false-discovery proportion at a nominal FDR of 0.05, how many changed cells with ≥ 300
 * expected readings were found, and how many cells are flagged when nothing changed.
 *
 *   npm run build && node dist/bench/compare-fdr.js [seeds] [emIterations] [priorStrength]
 */
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { emIteration } from '../src/fit/em-iteration.js';
import { compareCells } from '../src/compare/compare-cells.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { FloorGraph } from '../src/model/floor-graph.js';

const nSeeds = Number(process.argv[2] ?? 16);
const iterations = Number(process.argv[3] ?? 150);
const priorStrength = Number(process.argv[4] ?? 10);

// Invented 5 × 4 test building, 4 surfaces in a pattern where neighbouring cells differ.
const surfaces = ['oak', 'carpet', 'tile', 'rubber'];
const W = 5;
const H = 4;
const id = (x: number, y: number): string => `g-${x}-${y}`;
const floor: FloorGraph = { format: 'underfoot-floor/1', name: 'fdr bench', surfaces, cells: [], links: [] };
for (let y = 0; y < H; y++) {
  for (let x = 0; x < W; x++) {
    floor.cells.push({ id: id(x, y), surface: surfaces[(x + 2 * y) % 4], x, y, level: 0, start: false });
    if (x + 1 < W) floor.links.push({ from: id(x, y), to: id(x + 1, y), oneway: false });
    if (y + 1 < H) floor.links.push({ from: id(x, y), to: id(x, y + 1), oneway: false });
  }
}
const m = surfaces.length;
const n = floor.cells.length;

function simulate(model: HmmModel, seed: number): Array<{ id: string; obs: Int32Array }> {
  const rng = new SeededRandom(seed);
  return Array.from({ length: 40 }, (_, r) => ({ id: `r${r}`, obs: sampleRun(model, 300, rng, 0.02).obs }));
}

function neighbours(i: number): number[] {
  const cid = floor.cells[i].id;
  return floor.links.flatMap((l) => (l.from === cid ? [l.to] : l.to === cid ? [l.from] : [])).map((x) => floor.cells.findIndex((c) => c.id === x));
}

function trial(seed: number, k: number) {
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(200 * truth.emission[i * m + r]);
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
  const changed = new Set<number>();
  while (changed.size < k) changed.add(rng.int(n));
  const after: HmmModel = { ...truth, emission: truth.emission.slice() };
  for (const i of changed) {
    const nearby = new Set([floor.cells[i].surface, ...neighbours(i).map((j) => floor.cells[j].surface)]);
    const options = surfaces.map((_, r) => r).filter((r) => !nearby.has(surfaces[r]));
    const to = options.length ? options[rng.int(options.length)] : (surfaces.indexOf(floor.cells[i].surface) + 1) % m;
    for (let r = 0; r < m; r++) after.emission[i * m + r] = r === to ? 0.85 : 0.05;
  }
  const oldRuns = simulate(truth, seed + 1);
  let calibrated = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const survey = calibrated.emission.slice();
  for (let it = 0; it < iterations; it++) calibrated = emIteration(calibrated, oldRuns, { mode: 'fixed', priorStrength: 10, prior: survey }).model;
  const oldCounts = emIteration(calibrated, oldRuns, { mode: 'fixed', priorStrength: 0 }).counts.emitT;
  const newRuns = simulate(after, seed + 2);
  let refit = calibrated;
  for (let it = 0; it < iterations; it++) refit = emIteration(refit, newRuns, { mode: 'fixed', priorStrength, prior: calibrated.emission }).model;
  const newCounts = emIteration(refit, newRuns, { mode: 'fixed', priorStrength: 0 }).counts.emitT;
  const res = process.env.PROFILE ? profileCompare(calibrated, refit, newRuns, newCounts, Number(process.env.PROFILE)) : compareCells(calibrated, oldCounts, newCounts, { fdr: 0.05, minReadings: 100 });
  const byId = new Map(floor.cells.map((c, i) => [c.id, i]));
  let discoveries = 0, falseDiscoveries = 0, adjacentFalse = 0, found = 0, testable = 0;
  for (const row of res.changes) {
    const i = byId.get(row.cell)!;
    if (row.verdict === 'changed') {
      discoveries++;
      if (!changed.has(i)) {
        falseDiscoveries++;
        if (neighbours(i).some((j) => changed.has(j))) adjacentFalse++;
      }
    }
    if (changed.has(i) && row.expectedReadings >= 300) {
      testable++;
      if (row.verdict === 'changed') found++;
    }
  }
  return { discoveries, falseDiscoveries, adjacentFalse, found, testable, inflation: res.inflation };
}

import { chainFromModel } from '../src/model/chain-from-model.js';
import { forwardScore } from '../src/kernels/forward-score.js';
import { chiSquareSurvival } from '../src/compare/chi-square-survival.js';
import { benjaminiHochberg } from '../src/compare/benjamini-hochberg.js';
function logLik(model: HmmModel, runs: Array<{ obs: Int32Array }>): number {
  const c = chainFromModel(model);
  const w = new Float64Array(2 * n);
  return runs.reduce((s, r) => s + forwardScore(c, r.obs, r.obs.length, w), 0);
}
/** Profile likelihood ratio per cell: row i held at the old row, other rows re-optimised for `k` EM steps from the re-fit. */
function profileCompare(old: HmmModel, refit: HmmModel, runs: Array<{ id: string; obs: Int32Array }>, newCounts: Float64Array, k: number) {
  const base = logLik(refit, runs);
  const tested: number[] = [];
  const p: number[] = [];
  const changes = floor.cells.map((c, i) => {
    let t = 0;
    for (let r = 0; r < m; r++) t += newCounts[r * n + i];
    return { cell: c.id, expectedReadings: t, verdict: 'too-few-readings' as string };
  });
  for (let i = 0; i < n; i++) {
    if (changes[i].expectedReadings < 100) continue;
    let model: HmmModel = { ...refit, emission: refit.emission.slice() };
    for (let r = 0; r < m; r++) model.emission[i * m + r] = old.emission[i * m + r];
    for (let it = 0; it < k; it++) {
      const next = emIteration(model, runs, { mode: 'fixed', priorStrength: 0 }).model;
      for (let r = 0; r < m; r++) next.emission[i * m + r] = old.emission[i * m + r];
      model = next;
    }
    const lr = Math.max(0, 2 * (base - logLik(model, runs)));
    tested.push(i);
    p.push(chiSquareSurvival(lr, m - 1));
  }
  const q = benjaminiHochberg(p);
  tested.forEach((i, t) => (changes[i].verdict = q[t] <= 0.05 ? 'changed' : 'unchanged'));
  return { changes, inflation: 1 };
}

const seeds = Array.from({ length: nSeeds }, (_, s) => 101 + 7 * s);
let fdp = 0, found = 0, testable = 0, adjacent = 0, falseTotal = 0, nullFlagged = 0, lambda = 0;
for (const seed of seeds) {
  const t = trial(seed, 3);
  fdp += t.falseDiscoveries / Math.max(1, t.discoveries);
  found += t.found;
  testable += t.testable;
  adjacent += t.adjacentFalse;
  falseTotal += t.falseDiscoveries;
  lambda += t.inflation;
  nullFlagged += trial(seed, 0).discoveries;
}
console.log(`compare on simulated refurbishments: ${nSeeds} seeds, 20 cells, 3 changed, ${iterations} EM iterations, prior strength ${priorStrength}`);
console.log(`mean false-discovery proportion ${(fdp / nSeeds).toFixed(3)} (nominal 0.05); false discoveries next to a changed cell: ${adjacent} of ${falseTotal}`);
console.log(`changed cells with ≥ 300 expected readings found: ${found} of ${testable}; mean calibration factor λ ${(lambda / nSeeds).toFixed(2)}`);
console.log(`no change: ${nullFlagged} cells flagged over ${nSeeds} trials`);
