/**
 * Simulated refurbishments for `compare` (bench/compare-fdr.ts and test/compare/refurbishment-kinds.test.ts):
 * two invented buildings, four kinds of refurbishment, and one trial of compare's whole procedure (the
 * re-fit search, the null draws, the per-cell and per-region tests, Benjamini–Hochberg over regions,
 * the cells `--write-floor` would write).
 *
 * Floors:
 * - `offices`: 8 × 4 cells; three offices of one surface each (carpet, rubber, carpet; zones
 *   `office-0`…`office-2`) over a corridor of oak and tile repeating (zone `corridor`); runs start at
 *   the corridor's two ends (the docks).
 * - `stripes`: 5 × 4 cells, four surfaces repeating so that every neighbour differs, no zones, runs
 *   start anywhere; "rooms" are its 2 × 2 blocks and the "corridor" its second row.
 * Refurbishments: `room` (every cell of one room re-floored), `stretch` (3 consecutive corridor
 * cells), `worn` (one cell), `none`. A change gives the changed cells one new surface that none of
 * them had (row: 0.85 on it, the rest spread).
 * Truth: `buildModel(floor, { dwell: 0.6, hit: 0.85 })`, every row redrawn from a Dirichlet of
 * concentration 200 × row. Old runs and new runs: 30 runs of 300 steps each, 2 % dropouts. The old
 * model: `fit` on the old runs (4 restarts, fixed transitions), with its recorded expected readings.
 */
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../src/fit/fit-model.js';
import { compareCells, type CellComparison } from '../src/compare/compare-cells.js';
import { DEFAULT_REGION_OPTIONS, type RegionOptions } from '../src/compare/build-regions.js';
import { drawNullRuns } from '../src/compare/draw-null-runs.js';
import { searchRefit, DEFAULT_REFIT_SEARCH, type RefitSearchOptions } from '../src/compare/search-refit.js';
import { nullDrawSearch } from '../src/compare/null-draw-search.js';
import { placedChanges } from '../src/compare/placed-changes.js';
import { packRuns } from '../src/fit/packed-runs.js';
import { LocalEngine } from '../src/fit/local-engine.js';
import { toBlocks } from '../src/fit/to-blocks.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { logChain } from '../src/decode/log-chain.js';
import { viterbiPath } from '../src/decode/viterbi-path.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { FloorGraph } from '../src/model/floor-graph.js';

export type BenchFloor = 'offices' | 'stripes';
export type RefurbishmentKind = 'room' | 'stretch' | 'worn' | 'none';
export const REFURBISHMENT_KINDS: readonly RefurbishmentKind[] = ['room', 'stretch', 'worn', 'none'];

export interface BenchBuilding {
  floor: FloorGraph;
  /** Rooms (cell indices), for `room` refurbishments. */
  rooms: number[][];
  /** Corridor cells in order, for `stretch` refurbishments. */
  corridor: number[];
}

const SURFACES = ['oak', 'carpet', 'tile', 'rubber', 'concrete'];
const id = (x: number, y: number): string => `g-${x}-${y}`;

export function benchBuilding(layout: BenchFloor): BenchBuilding {
  const floor: FloorGraph = { format: 'underfoot-floor/1', name: `refurbishment bench (${layout})`, surfaces: SURFACES.slice(), cells: [], links: [] };
  const rooms: number[][] = [];
  const corridor: number[] = [];
  if (layout === 'offices') {
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
        floor.cells.push({ id: id(x, y), surface: SURFACES[(x + 2 * y) % 4], x, y, level: 0, start: false });
        if (x + 1 < W) floor.links.push({ from: id(x, y), to: id(x + 1, y), oneway: false });
        if (y + 1 < H) floor.links.push({ from: id(x, y), to: id(x, y + 1), oneway: false });
      }
    }
    for (let x = 0; x + 1 < W; x += 2) for (let y = 0; y + 1 < H; y += 2) rooms.push([y * W + x, y * W + x + 1, (y + 1) * W + x, (y + 1) * W + x + 1]);
    for (let x = 0; x < W; x++) corridor.push(W + x);
  }
  return { floor, rooms, corridor };
}

export interface SimulatedRun {
  id: string;
  obs: Int32Array;
  cells: Int32Array;
}

function simulate(model: HmmModel, seed: number): SimulatedRun[] {
  const rng = new SeededRandom(seed);
  return Array.from({ length: 30 }, (_, r) => {
    const s = sampleRun(model, 300, rng, 0.02);
    return { id: `r${r}`, obs: s.obs, cells: s.cells };
  });
}

/** One refurbishment: the old model (calibrated on old runs), the true new model, and the new runs. */
export async function refurbishment(b: BenchBuilding, seed: number, kind: RefurbishmentKind) {
  const { floor } = b;
  const n = floor.cells.length;
  const m = floor.surfaces.length;
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(200 * truth.emission[i * m + r]);
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
  let changedList: number[] = [];
  if (kind === 'room') changedList = b.rooms[rng.int(b.rooms.length)];
  else if (kind === 'stretch') {
    const at = rng.int(b.corridor.length - 2);
    changedList = b.corridor.slice(at, at + 3);
  } else if (kind === 'worn') changedList = [rng.int(n)];
  const changed = new Set(changedList);
  const after: HmmModel = { ...truth, emission: truth.emission.slice() };
  let newSurface: string | null = null;
  if (changed.size) {
    const had = new Set([...changed].map((i) => floor.cells[i].surface));
    const options = floor.surfaces.map((_, r) => r).filter((r) => !had.has(floor.surfaces[r]));
    const to = options[rng.int(options.length)];
    newSurface = floor.surfaces[to];
    for (const i of changed) for (let r = 0; r < m; r++) after.emission[i * m + r] = r === to ? 0.85 : 0.15 / (m - 1);
  }
  const oldRuns = simulate(truth, seed + 1);
  // The old model as users make it: `fit` (4 restarts, 20 % held out, final pass; fixed transitions),
  // and its expected readings per cell as the model file records them (`fit.cellReadings`).
  const { model: old, record } = await fitModel({ floor, runs: oldRuns, floorDigest: '', runsDigests: [] }, { ...DEFAULT_FIT_OPTIONS, transitions: 'fixed', dwell: 0.6, hit: 0.85, restarts: 4, seed }, 1);
  const oldCounts = new Float64Array(n * m);
  record.cellReadings!.forEach((row, i) => row.forEach((v, r) => (oldCounts[r * n + i] = v)));
  return { old, oldCounts, after, changed, newSurface, newRuns: simulate(after, seed + 2) };
}

/** The re-fit loop of these trials: `compare`'s defaults (fixed transitions here, as the old fit). */
export const TRIAL_LOOP = { mode: 'fixed' as const, priorStrength: 10, maxIter: 200, tol: 1e-6 };

export interface TrialOptions {
  nullDraws: number;
  regions?: RegionOptions | false;
  /** The search of the observed re-fit. @default DEFAULT_REFIT_SEARCH */
  search?: Omit<RefitSearchOptions, 'loop'>;
  /** The null draws' search: compare's (`warm`: warm start and swaps) or the whole search (`full`). @default 'warm' */
  nullSearch?: 'warm' | 'full';
}

export interface TrialResult {
  comparison: CellComparison;
  changed: Set<number>;
  refit: HmmModel;
  after: HmmModel;
  newRuns: SimulatedRun[];
  /** Reported regions, those holding no changed cell, cells of reported regions beyond the changed ones. */
  reported: number;
  falseRegions: number;
  extra: number[];
  /** Changed cells with ≥ 300 expected readings, and those inside a reported region. */
  testable: number;
  found: number;
  /** Cells `--write-floor` would write: all of them, and those that did not change. */
  written: Map<string, string>;
  writtenUnchanged: string[];
  /** Written changed cells given a surface other than the true new one. */
  writtenWrongSurface: string[];
  /** Seconds: the observed re-fit (whole search), the null draws' re-fits. */
  seconds: { search: number; draws: number };
}

/** One trial of compare's whole procedure on a refurbishment (deterministic for a seed). */
export async function refurbishmentTrial(b: BenchBuilding, seed: number, kind: RefurbishmentKind, options: TrialOptions): Promise<TrialResult> {
  const { floor } = b;
  const { old, oldCounts, after, changed, newSurface, newRuns } = await refurbishment(b, seed, kind);
  const search = options.search ?? DEFAULT_REFIT_SEARCH;
  const refitOf = async (runs: ReadonlyArray<{ id: string; obs: Int32Array }>, how: Omit<RefitSearchOptions, 'loop'>) => {
    const packed = packRuns(runs);
    const engine = new LocalEngine(packed, { mode: 'fixed' });
    return searchRefit(engine, packed, toBlocks(runs.map((_, r) => r), 8), old, { ...how, loop: { ...TRIAL_LOOP, prior: old.emission } });
  };
  const t0 = performance.now();
  const found = await refitOf(newRuns, search);
  const t1 = performance.now();
  const draws: Float64Array[] = [];
  const nullHow = options.nullSearch === 'full' ? search : nullDrawSearch(search);
  for (let k = 0; k < options.nullDraws; k++) draws.push((await refitOf(drawNullRuns(old, newRuns, seed * 1000 + k), nullHow)).counts.emitT);
  const t2 = performance.now();
  const comparison = compareCells(old, oldCounts, found.counts.emitT, { fdr: 0.05, minReadings: 100, oldPriorStrength: 10, regions: options.regions ?? DEFAULT_REGION_OPTIONS }, draws);
  const index = new Map(floor.cells.map((c, i) => [c.id, i] as const));
  const isChanged = (cell: string) => changed.has(index.get(cell)!);
  const reportedRegions = comparison.regions.filter((r) => r.verdict === 'changed');
  let testable = 0;
  let foundCells = 0;
  for (const row of comparison.changes) {
    if (isChanged(row.cell) && row.expectedReadings >= 300) {
      testable++;
      if (row.verdict === 'changed') foundCells++;
    }
  }
  const written = placedChanges(comparison, (cell) => floor.cells[index.get(cell)!].surface);
  return {
    comparison,
    changed,
    refit: found.model,
    after,
    newRuns,
    reported: reportedRegions.length,
    falseRegions: reportedRegions.filter((r) => !r.cells.some(isChanged)).length,
    extra: reportedRegions.map((r) => r.cells.filter((c) => !isChanged(c)).length),
    testable,
    found: foundCells,
    written,
    writtenUnchanged: [...written.keys()].filter((c) => !isChanged(c)),
    writtenWrongSurface: [...written].filter(([c, s]) => isChanged(c) && s !== newSurface).map(([c]) => c),
    seconds: { search: (t1 - t0) / 1000, draws: (t2 - t1) / 1000 },
  };
}

/** Viterbi decoding of the runs by `model`: share of steps within 1.5 m of the true cell, and in its zone. */
export function decodeShare(floor: FloorGraph, model: HmmModel, runs: SimulatedRun[]): { near: number; zone: number } {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  let near = 0;
  let zone = 0;
  let steps = 0;
  for (const r of runs) {
    const path = new Int32Array(r.obs.length);
    viterbiPath(chain, log, r.obs, 1 << 26, path);
    for (let t = 0; t < path.length; t++) {
      const a = floor.cells[path[t]];
      const c = floor.cells[r.cells[t]];
      steps++;
      if (Math.hypot(a.x - c.x, a.y - c.y) <= 1.5) near++;
      if ((a.zone ?? null) === (c.zone ?? null)) zone++;
    }
  }
  return { near: near / steps, zone: zone / steps };
}
