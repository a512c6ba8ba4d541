/**
 * Measures `compare`'s statistical behaviour on simulated refurbishments (not part of `npm test`; the
 * figures are in DEVELOPERS.md, "compare"). The re-fit is compare's own search; the null draws, the
 * regions and the test are compare's own. Refurbishments (per seed, one of each): a whole room
 * re-floored, a corridor stretch of 3 cells, a single worn cell, and nothing changed. Prints, by kind:
 *
 * - the false-discovery proportion by region (a reported region holding no changed cell is false),
 *   mean over trials with a report, at a nominal FDR of 0.05;
 * - the share of changed cells with ≥ 300 expected readings that lie inside a reported region;
 * - how many cells the reported regions hold beyond the changed ones (mean per reported region, and
 *   the largest region);
 * - decoding of the new runs (Viterbi) by the re-fitted model and by the true new model: share of
 *   steps within 1.5 m of the true cell, and in the true cell's zone.
 *
 *   npm run build && node dist/bench/compare-fdr.js [seeds] [nullDraws]
 *
 * `REACH=` and `LOOKALIKE=` set the regions' reach (links) and look-alike threshold (total variation);
 * `REACH=0 LOOKALIKE=-1` makes every cell its own region (cells tested alone, for comparison).
 * `FLOOR=` picks the invented building: `offices` (default: three offices of one surface each, zones,
 * over a corridor of repeating surfaces; runs start at the two corridor ends, the docks) or `stripes`
 * (5 × 4 cells, 4 surfaces repeating so that every neighbour differs, no zones, runs start anywhere;
 * rooms are 2 × 2 blocks there).
 */
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { emIteration } from '../src/fit/em-iteration.js';
import { compareCells } from '../src/compare/compare-cells.js';
import { DEFAULT_REGION_OPTIONS } from '../src/compare/build-regions.js';
import { drawNullRuns } from '../src/compare/draw-null-runs.js';
import { searchRefit, DEFAULT_REFIT_SEARCH } from '../src/compare/search-refit.js';
import { packRuns } from '../src/fit/packed-runs.js';
import { LocalEngine } from '../src/fit/local-engine.js';
import { toBlocks } from '../src/fit/to-blocks.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { logChain } from '../src/decode/log-chain.js';
import { viterbiPath } from '../src/decode/viterbi-path.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { FloorGraph } from '../src/model/floor-graph.js';

const nSeeds = Number(process.argv[2] ?? 2);
const nullDraws = Number(process.argv[3] ?? 3);
const iterations = 200;
const priorStrength = 10;

const layout = process.env.FLOOR ?? 'offices';
// REACH=k and LOOKALIKE=tv change how regions are formed; REACH=0 LOOKALIKE=-1 tests cells alone.
const regionOptions = { ...DEFAULT_REGION_OPTIONS, ...(process.env.REACH ? { reach: Number(process.env.REACH) } : {}), ...(process.env.LOOKALIKE ? { lookAlikeTv: Number(process.env.LOOKALIKE) } : {}) };
const surfaces = ['oak', 'carpet', 'tile', 'rubber', 'concrete'];
const id = (x: number, y: number): string => `g-${x}-${y}`;
const floor: FloorGraph = { format: 'underfoot-floor/1', name: 'fdr bench', surfaces, cells: [], links: [] };
// Rooms (sets of cell indices) and the corridor (cells in order), for the refurbishments.
const rooms: number[][] = [];
const corridor: number[] = [];
if (layout === 'offices') {
  // 8 × 4: offices x 0–2, 3–5, 6–7 over rows 0–2 (one surface each), corridor on row 3 (oak, tile repeating).
  const W = 8;
  const officeOf = (x: number) => (x < 3 ? 0 : x < 6 ? 1 : 2);
  const officeSurface = ['carpet', 'rubber', 'carpet'];
  for (let y = 0; y < 4; y++) {
    for (let x = 0; x < W; x++) {
      const office = y < 3;
      floor.cells.push({ id: id(x, y), surface: office ? officeSurface[officeOf(x)] : x % 2 ? 'tile' : 'oak', x, y, level: 0, start: !office && (x === 0 || x === W - 1), zone: office ? `office-${officeOf(x)}` : 'corridor' });
      if (x + 1 < W && (!office || officeOf(x) === officeOf(x + 1))) floor.links.push({ from: id(x, y), to: id(x + 1, y), oneway: false });
      if (y + 1 < 4 && (y + 1 < 3 || x % 3 === 1 || x === 7)) floor.links.push({ from: id(x, y), to: id(x, y + 1), oneway: false });
    }
  }
  for (let k = 0; k < 3; k++) rooms.push(floor.cells.flatMap((c, i) => (c.zone === `office-${k}` ? [i] : [])));
  for (let x = 0; x < W; x++) corridor.push(3 * W + x);
} else {
  const W = 5;
  const H = 4;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      floor.cells.push({ id: id(x, y), surface: surfaces[(x + 2 * y) % 4], x, y, level: 0, start: false });
      if (x + 1 < W) floor.links.push({ from: id(x, y), to: id(x + 1, y), oneway: false });
      if (y + 1 < H) floor.links.push({ from: id(x, y), to: id(x, y + 1), oneway: false });
    }
  }
  for (let x = 0; x + 1 < W; x += 2) for (let y = 0; y + 1 < H; y += 2) rooms.push([y * W + x, y * W + x + 1, (y + 1) * W + x, (y + 1) * W + x + 1]);
  for (let x = 0; x < W; x++) corridor.push(W + x);
}
const m = surfaces.length;
const n = floor.cells.length;

function simulate(model: HmmModel, seed: number) {
  const rng = new SeededRandom(seed);
  return Array.from({ length: 30 }, (_, r) => {
    const s = sampleRun(model, 300, rng, 0.02);
    return { id: `r${r}`, obs: s.obs, cells: s.cells };
  });
}

type Kind = 'room' | 'stretch' | 'worn' | 'none';

function changedCells(kind: Kind, rng: SeededRandom): number[] {
  if (kind === 'room') return rooms[rng.int(rooms.length)];
  if (kind === 'stretch') {
    const at = rng.int(corridor.length - 2);
    return corridor.slice(at, at + 3);
  }
  if (kind === 'worn') return [rng.int(n)];
  return [];
}

function decodeShare(model: HmmModel, runs: ReturnType<typeof simulate>): { near: number; zone: number } {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  let near = 0, zone = 0, steps = 0;
  for (const r of runs) {
    const path = new Int32Array(r.obs.length);
    viterbiPath(chain, log, r.obs, 1 << 26, path);
    for (let t = 0; t < path.length; t++) {
      const a = floor.cells[path[t]];
      const b = floor.cells[r.cells[t]];
      steps++;
      if (Math.hypot(a.x - b.x, a.y - b.y) <= 1.5) near++;
      if ((a.zone ?? null) === (b.zone ?? null)) zone++;
    }
  }
  return { near: near / steps, zone: zone / steps };
}

async function trial(seed: number, kind: Kind) {
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(200 * truth.emission[i * m + r]);
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
  const changed = new Set(changedCells(kind, rng));
  const after: HmmModel = { ...truth, emission: truth.emission.slice() };
  if (changed.size) {
    // One new surface for the whole change, one that none of the changed cells had.
    const had = new Set([...changed].map((i) => floor.cells[i].surface));
    const options = surfaces.map((_, r) => r).filter((r) => !had.has(surfaces[r]));
    const to = options[rng.int(options.length)];
    for (const i of changed) for (let r = 0; r < m; r++) after.emission[i * m + r] = r === to ? 0.85 : 0.15 / (m - 1);
  }
  const oldRuns = simulate(truth, seed + 1);
  let calibrated = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const survey = calibrated.emission.slice();
  for (let it = 0; it < 100; it++) calibrated = emIteration(calibrated, oldRuns, { mode: 'fixed', priorStrength: 10, prior: survey }).model;
  const oldCounts = emIteration(calibrated, oldRuns, { mode: 'fixed', priorStrength: 0 }).counts.emitT;
  const newRuns = simulate(after, seed + 2);
  const refitOf = async (runs: Array<{ id: string; obs: Int32Array }>) => {
    const packed = packRuns(runs);
    const engine = new LocalEngine(packed, { mode: 'fixed' });
    const found = await searchRefit(engine, packed, toBlocks(runs.map((_, r) => r), 8), calibrated, {
      ...DEFAULT_REFIT_SEARCH,
      loop: { mode: 'fixed', priorStrength, prior: calibrated.emission, maxIter: iterations, tol: 1e-7 },
    });
    return { refit: found.model, counts: found.counts.emitT };
  };
  const { refit, counts } = await refitOf(newRuns);
  const draws: Float64Array[] = [];
  for (let b = 0; b < nullDraws; b++) draws.push((await refitOf(drawNullRuns(calibrated, newRuns, seed * 1000 + b))).counts);
  const res = compareCells(calibrated, oldCounts, counts, { fdr: 0.05, minReadings: 100, oldPriorStrength: 10, regions: regionOptions }, draws);
  const byId = new Map(floor.cells.map((c, i) => [c.id, i]));
  const reported = res.regions.filter((r) => r.verdict === 'changed');
  const falseRegions = reported.filter((r) => !r.cells.some((c) => changed.has(byId.get(c)!))).length;
  const extra = reported.map((r) => r.cells.filter((c) => !changed.has(byId.get(c)!)).length);
  let testable = 0, found = 0;
  for (const row of res.changes) {
    if (changed.has(byId.get(row.cell)!) && row.expectedReadings >= 300) {
      testable++;
      if (row.verdict === 'changed') found++;
    }
  }
  const decodeRefit = decodeShare(refit, newRuns);
  const decodeTrue = decodeShare(after, newRuns);
  if (process.env.DEBUG) {
    console.log(`seed ${seed} ${kind}: changed ${[...changed].map((i) => floor.cells[i].id).join(';') || '-'}`);
    for (const r of reported) console.log(`  ${r.region} q=${r.qValue?.toExponential(1)} ${r.cells.join(';')}`);
  }
  return { reported: reported.length, falseRegions, extra, testable, found, decodeRefit, decodeTrue };
}

const seeds = Array.from({ length: nSeeds }, (_, s) => 101 + 7 * s);
console.log(`compare on simulated refurbishments (${layout} floor, ${n} cells): ${nSeeds} seeds per kind, 30 new runs of 300 steps, ${nullDraws} null draws`);
console.log('kind     trials  reported  FDP by region  changed cells (≥300 readings) in a reported region  extra cells per region (max)  decode within 1.5 m / zone: re-fit vs true new model');
for (const kind of ['room', 'stretch', 'worn', 'none'] as Kind[]) {
  let fdp = 0, withReport = 0, reported = 0, testable = 0, found = 0, extra = 0, maxExtra = 0;
  const dec = { rn: 0, rz: 0, tn: 0, tz: 0 };
  for (const seed of seeds) {
    const t = await trial(seed, kind);
    if (t.reported) {
      withReport++;
      fdp += t.falseRegions / t.reported;
    }
    reported += t.reported;
    testable += t.testable;
    found += t.found;
    extra += t.extra.reduce((a, b) => a + b, 0);
    maxExtra = Math.max(maxExtra, ...t.extra, 0);
    dec.rn += t.decodeRefit.near / nSeeds;
    dec.rz += t.decodeRefit.zone / nSeeds;
    dec.tn += t.decodeTrue.near / nSeeds;
    dec.tz += t.decodeTrue.zone / nSeeds;
  }
  console.log(
    `${kind.padEnd(8)} ${String(nSeeds).padStart(6)}  ${String(reported).padStart(8)}  ${(withReport ? (fdp / withReport).toFixed(3) : '-').padStart(13)}  ${`${found} of ${testable}`.padStart(52)}  ${`${reported ? (extra / reported).toFixed(1) : '-'} (${maxExtra})`.padStart(28)}  ${(100 * dec.rn).toFixed(1)} % / ${(100 * dec.rz).toFixed(1)} % vs ${(100 * dec.tn).toFixed(1)} % / ${(100 * dec.tz).toFixed(1)} %`,
  );
}
