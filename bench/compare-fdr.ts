/**
 * Measures `compare`'s statistical behaviour on simulated refurbishments (not part of `npm test`; the
 * figures are in DEVELOPERS.md, "compare"). The re-fit is compare's own search; the null draws and the
 * test are compare's own. Prints, over repeated seeds,
 * the mean false-discovery proportion at a nominal FDR of 0.05, how many changed cells with ≥ 300
 * expected readings were found, how many cells are flagged when nothing changed, and how far the
 * re-fit's log-likelihood is below that of EM started from the true changed model. `DEBUG=1` prints
 * every cell of every trial.
 *
 *   npm run build && node dist/bench/compare-fdr.js [seeds] [emIterations] [priorStrength] [nullDraws]
 */
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { emIteration } from '../src/fit/em-iteration.js';
import { compareCells } from '../src/compare/compare-cells.js';
import { drawNullRuns } from '../src/compare/draw-null-runs.js';
import { searchRefit, DEFAULT_REFIT_SEARCH } from '../src/compare/search-refit.js';
import { packRuns } from '../src/fit/packed-runs.js';
import { LocalEngine } from '../src/fit/local-engine.js';
import { toBlocks } from '../src/fit/to-blocks.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { FloorGraph } from '../src/model/floor-graph.js';

const nSeeds = Number(process.argv[2] ?? 8);
const iterations = Number(process.argv[3] ?? 200);
const priorStrength = Number(process.argv[4] ?? 10);
const nullDraws = Number(process.argv[5] ?? 5);

// Invented test buildings (FLOOR=stripes|random|rooms): `stripes` (default) 5 × 4 cells, 4 surfaces in a
// diagonal pattern where every neighbour differs (each reading fits many places: the hardest case);
// `random` 6 × 5 cells with 5 surfaces drawn at random (a varied floor); `rooms` 6 × 4 cells in 2 × 2
// rooms of one surface each (5 surfaces).
const layout = process.env.FLOOR ?? 'stripes';
const surfaces = layout === 'stripes' ? ['oak', 'carpet', 'tile', 'rubber'] : ['oak', 'carpet', 'tile', 'rubber', 'concrete'];
const W = layout === 'stripes' ? 5 : 6;
const H = layout === 'random' ? 5 : 4;
const layoutRng = new SeededRandom(77);
const roomSurface = Array.from({ length: 6 }, () => layoutRng.int(5));
const surfaceAt = (x: number, y: number): string =>
  layout === 'stripes' ? surfaces[(x + 2 * y) % 4] : layout === 'random' ? surfaces[layoutRng.int(5)] : surfaces[roomSurface[Math.floor(x / 2) + 3 * Math.floor(y / 2)]];
const id = (x: number, y: number): string => `g-${x}-${y}`;
const floor: FloorGraph = { format: 'underfoot-floor/1', name: 'fdr bench', surfaces, cells: [], links: [] };
for (let y = 0; y < H; y++) {
  for (let x = 0; x < W; x++) {
    floor.cells.push({ id: id(x, y), surface: surfaceAt(x, y), x, y, level: 0, start: false });
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

async function trial(seed: number, k: number) {
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
  // The re-fit is compare's own search (src/compare/search-refit.ts), in one thread.
  const refitCounts = async (runs: Array<{ id: string; obs: Int32Array }>) => {
    const packed = packRuns(runs);
    const blocks = toBlocks(runs.map((_, r) => r), 8);
    const engine = new LocalEngine(packed, { mode: 'fixed' });
    const found = await searchRefit(engine, packed, blocks, calibrated, {
      ...DEFAULT_REFIT_SEARCH,
      ...(process.env.ROBUST !== undefined ? { robust: process.env.ROBUST.split(',').filter(Boolean).map(Number) } : {}),
      ...(process.env.SWAP !== undefined ? { swapRounds: Number(process.env.SWAP) } : {}),
      loop: { mode: 'fixed', priorStrength, prior: calibrated.emission, maxIter: iterations, tol: 1e-7 },
    });
    return { refit: found.model, counts: found.counts.emitT };
  };
  const { refit, counts: newCounts } = await refitCounts(newRuns);
  const draws: Float64Array[] = [];
  for (let b = 0; b < nullDraws; b++) draws.push((await refitCounts(drawNullRuns(calibrated, newRuns, seed * 1000 + b))).counts);
  const res = compareCells(calibrated, oldCounts, newCounts, { fdr: 0.05, minReadings: 100, oldPriorStrength: 10 }, draws);
  const byId = new Map(floor.cells.map((c, i) => [c.id, i]));
  // How far the re-fit is from the optimum EM finds when started from the true changed model (a
  // re-fit stuck in a worse local optimum cannot attribute the change to the right cells).
  let gap = 0;
  if (k > 0) {
    const ll = (mm: HmmModel) => emIteration(mm, newRuns, { mode: 'fixed', priorStrength: 0 }).counts.logLik;
    let fromTruth: HmmModel = after;
    for (let it = 0; it < iterations; it++) fromTruth = emIteration(fromTruth, newRuns, { mode: 'fixed', priorStrength, prior: calibrated.emission }).model;
    gap = ll(fromTruth) - ll(refit);
  }
  if (process.env.DEBUG && k > 0) {
    // Per cell: old row, true row after the change, re-fitted row, and the verdict.
    console.log(`seed ${seed}: EM from the true changed model ends ${gap.toFixed(1)} log-likelihood units above the re-fit`);
    const fmt = (a: ArrayLike<number>, i: number) => Array.from({ length: m }, (_, r) => a[i * m + r].toFixed(2)).join(' ');
    for (const row of res.changes) {
      const i = byId.get(row.cell)!;
      const tag = changed.has(i) ? 'CHANGED' : neighbours(i).some((j) => changed.has(j)) ? 'nbr' : '';
      console.log(`${row.cell} ${tag.padEnd(7)} old[${fmt(calibrated.emission, i)}] true-after[${fmt(after.emission, i)}] refit[${fmt(refit.emission, i)}] N=${row.expectedReadings.toFixed(0)} G=${(row as { gStat?: number }).gStat?.toFixed(1)} p=${(row as { pValue?: number }).pValue?.toExponential(1)} ${row.verdict}`);
    }
  }
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
  return { discoveries, falseDiscoveries, adjacentFalse, found, testable, inflation: res.inflation, gap };
}

const seeds = Array.from({ length: nSeeds }, (_, s) => 101 + 7 * s);
let fdp = 0, found = 0, testable = 0, adjacent = 0, falseTotal = 0, nullFlagged = 0, lambda = 0, gap = 0;
for (const seed of seeds) {
  const t = await trial(seed, 3);
  fdp += t.falseDiscoveries / Math.max(1, t.discoveries);
  found += t.found;
  testable += t.testable;
  adjacent += t.adjacentFalse;
  falseTotal += t.falseDiscoveries;
  lambda += t.inflation;
  gap += t.gap;
  nullFlagged += (await trial(seed, 0)).discoveries;
}
console.log(`compare on simulated refurbishments (${layout} floor): ${nSeeds} seeds, ${n} cells, 3 changed, ${iterations} EM iterations, prior strength ${priorStrength}, ${nullDraws} null draws`);
console.log(`mean false-discovery proportion ${(fdp / nSeeds).toFixed(3)} (nominal 0.05); false discoveries next to a changed cell: ${adjacent} of ${falseTotal}`);
console.log(`changed cells with ≥ 300 expected readings found: ${found} of ${testable}; mean calibration factor λ ${(lambda / nSeeds).toFixed(2)}`);
console.log(`no change: ${nullFlagged} cells flagged over ${nSeeds} trials`);
console.log(`log-likelihood of the new runs: EM started from the true changed model ends ${(gap / nSeeds).toFixed(1)} higher than the re-fit (mean)`);
