import type { TransitionMode } from '../model/hmm-model.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { readFloor } from '../io/read-floor.js';
import { readModel } from '../io/read-model.js';
import { fileDigest } from '../io/file-digest.js';
import { formatModel } from '../io/format-model.js';
import { formatFloor } from '../io/format-floor.js';
import { writeFileAtomic } from '../io/write-atomic.js';
import { writeTable } from '../io/write-table.js';
import { planOutputs } from '../io/plan-outputs.js';
import { outputTableFormatOf } from '../io/table-compression.js';
import type { OutputTable } from '../io/output-table.js';
import type { ModelFile } from '../io/model-file.js';
import { checkModelFloor } from '../model/check-model-floor.js';
import { withFloorZones } from '../model/with-floor-zones.js';
import { chainFromModel } from '../model/chain-from-model.js';
import type { HmmModel } from '../model/hmm-model.js';
import type { FloorGraph } from '../model/floor-graph.js';
import { forwardScore } from '../kernels/forward-score.js';
import { drawNullRuns } from '../compare/draw-null-runs.js';
import type { FitOptions, FitRecord, LoopRecord } from '../fit/fit-record.js';
import { packRuns } from '../fit/packed-runs.js';
import type { EStepEngine } from '../fit/e-step-engine.js';
import { LocalEngine } from '../fit/local-engine.js';
import { PoolEngine } from '../fit/pool-engine.js';
import type { EmLoopResult } from '../fit/em-loop.js';
import { intoFamily } from '../model/into-family.js';
import { firstDwell } from '../model/first-dwell.js';
import { toBlocks } from '../fit/to-blocks.js';
import { searchRefit, type RefitSearchOptions, type RefitSearchProgress, type RefitSearchResult } from '../compare/search-refit.js';
import { nullDrawSearch } from '../compare/null-draw-search.js';
import { placedChanges } from '../compare/placed-changes.js';
import { TOOL_VERSION } from '../version.js';
import { compareCells, type CellChange, type CompareOptions, type RegionChange } from '../compare/compare-cells.js';
import type { KeyColumns } from './key-columns.js';
import { loadRuns } from './load-runs.js';
import { wasmFallbackWarning } from './wasm-fallback-warning.js';

export interface CompareConfig {
  model: string;
  floor: string;
  runs: string[];
  /** Changes table (.csv / .arrow / .arrows), or null not to write one. */
  out: string | null;
  refit: string | null;
  writeFloor: string | null;
  compare: CompareOptions;
  /** Options of the re-fit (transitions, prior strength, iteration limit, tolerance, seed of the null draws). */
  fit: FitOptions;
  /** How the re-fit is searched for (candidate starts, swap search). */
  search: Omit<RefitSearchOptions, 'loop'>;
  workers: number;
  /** Copies of the new runs simulated under the old model to calibrate the p-values (0: quick screen). */
  nullDraws: number;
  keys: KeyColumns;
}

export interface RunShift {
  run: string;
  readings: number;
  before: number;
  after: number;
}

export interface CompareOutcome {
  changes: CellChange[];
  /** The regions (cells the runs cannot tell apart, tested as one unit), by q-value. */
  regions: RegionChange[];
  /** Reported changes (regions), and those placed on one cell (the only ones `--write-floor` writes). */
  nRegionsChanged: number;
  nPlaced: number;
  /** Reported changes spanning several cells: listed for inspection, never written to the floor. */
  unplaced: RegionChange[];
  /** Cells in reported regions. */
  nChanged: number;
  nTested: number;
  nTooFew: number;
  runs: RunShift[];
  /** Log-likelihood per reading of the new runs under the old and the re-fitted model. */
  beforePerReading: number;
  afterPerReading: number;
  refit: ModelFile;
  /** Median calibration factor (quick screen), or the median simulated null scale (with null draws). */
  inflation: number;
  nullDraws: number;
  /** The test's options as used. */
  options: CompareOptions;
  newFloor: FloorGraph | null;
  warnings: string[];
}

/**
 * `compare`: after flooring changes, which cells changed. Scores the new runs under the old model, re-fits
 * by EM warm-started from the old model (`fit --from`), takes each cell's expected reading counts under
 * the re-fitted model, tests them against the old row (G test, Benjamini–Hochberg), and writes the
 * changes table, optionally the re-fitted model and a floor whose changed cells carry their new surface.
 */
/** Progress of the re-fit (`draw` 0) and of each null draw's re-fit (`draw` 1…`draws`). */
export interface CompareProgress extends RefitSearchProgress {
  draw: number;
  draws: number;
}

export async function compareFromFiles(config: CompareConfig, onProgress?: (p: CompareProgress) => void): Promise<CompareOutcome> {
  if (config.out) outputTableFormatOf(config.out);
  await planOutputs(
    'compare',
    [{ path: config.model, what: '--model' }, { path: config.floor, what: '--floor' }, ...config.runs.map((r) => ({ path: r, what: '--runs' }))],
    [{ path: config.out, what: '--out' }, { path: config.refit, what: '--refit' }, { path: config.writeFloor, what: '--write-floor' }],
  );
  const floor = await readFloor(config.floor);
  const old = await readModel(config.model);
  checkModelFloor(old.model, config.model, floor, config.floor);
  const withOdometry = await loadRuns(config.runs, { surfaces: floor.surfaces, ...config.keys });
  // Odometry is used when the old model has movement parameters (held fixed: flooring does not change
  // how the robot moves); otherwise it is read and checked, then ignored with a warning.
  const useOdometry = withOdometry.movement !== null && old.model.movement !== undefined;
  const loaded = useOdometry ? withOdometry : { ...withOdometry, runs: withOdometry.runs.map(({ moves: _moves, ...run }) => run) };
  const options: FitOptions = { ...config.fit, fromDigest: await fileDigest(config.model) };
  const floorDigest = await fileDigest(config.floor);
  // resolveCompareOptions admits only fixed, tied and learned (never auto).
  const mode = options.transitions as TransitionMode;
  const start = intoFamily(old.model, mode, options.dwell);
  const search: RefitSearchOptions = {
    ...config.search,
    loop: { mode, priorStrength: options.priorStrength, prior: old.model.emission.slice(), maxIter: options.maxIter, tol: options.tol },
  };
  const n = old.model.cells.length;
  const m = old.model.surfaces.length;
  // Each re-fit (of the new runs: the whole search; of every null draw: its warm start and swap
  // search) starts from the old model with the prior centred on the old rows. Readings are then attributed to cells by the RE-FITTED model:
  // under the old model a changed cell's new readings would be credited to look-alike neighbours.
  const refitOf = async (runs: ReadonlyArray<{ id: string; obs: Int32Array; moves?: MoveSteps }>, draw: number, how: RefitSearchOptions) => {
    const packed = packRuns(runs, config.workers > 1);
    const blocks = toBlocks(runs.map((_, r) => r), options.blockSize);
    const engine: EStepEngine = config.workers > 1 ? new PoolEngine(packed, config.workers, { mode }) : new LocalEngine(packed, { mode });
    try {
      const found = await searchRefit(engine, packed, blocks, start, how, onProgress ? (p) => onProgress({ ...p, draw, draws: config.nullDraws }) : undefined);
      return { found, countsT: found.counts.emitT, nReadings: found.counts.nReadings };
    } finally {
      await engine.close();
    }
  };
  const observed = await refitOf(loaded.runs, 0, search);
  const refit = observed.found.model;
  const nullCounts: Float64Array[] = [];
  for (let b = 1; b <= config.nullDraws; b++) {
    // Each draw: the warm start and the swap search only (null-draw-search.ts), not the whole search.
    nullCounts.push((await refitOf(drawNullRuns(old.model, loaded.runs, nullDrawSeed(options.seed, b)), b, nullDrawSearch(search))).countsT);
  }
  const { changes, regions, inflation } = compareCells(
    // Regions never cross the floor's zones (the floor's, which may be newer than the model's).
    withFloorZones(old.model, floor),
    oldCountsT(old),
    observed.countsT,
    { ...config.compare, oldPriorStrength: old.fit?.options?.priorStrength ?? 0 },
    nullCounts,
  );
  const record = refitRecord(observed.found, observed.countsT, observed.nReadings, n, m, {
    floorDigest,
    runsDigests: loaded.digests,
    options,
    runIds: loaded.runs.map((r) => r.id),
    startDwell: firstDwell(start),
  });
  const runs = scoreShift(old.model, refit, loaded.runs);
  const readings = runs.reduce((s, r) => s + r.readings, 0);
  const before = runs.reduce((s, r) => s + r.before, 0) / Math.max(1, readings);
  const after = runs.reduce((s, r) => s + r.after, 0) / Math.max(1, readings);
  const refitFile: ModelFile = { name: old.name, model: withFloorZones(refit, floor), fit: record };
  const reported = regions.filter((r) => r.verdict === 'changed');
  const placed = new Set(reported.filter((r) => r.cells.length === 1).map((r) => r.cells[0]));
  const unplaced = reported.filter((r) => r.cells.length > 1);
  let newFloor: FloorGraph | null = null;
  if (config.writeFloor) {
    // Only changes the runs place on one cell; a region's change could be at any of its cells.
    const surveyed = new Map(floor.cells.map((c) => [c.id, c.surface] as const));
    const changed = placedChanges({ changes, regions }, (id) => surveyed.get(id));
    newFloor = { ...floor, cells: floor.cells.map((c) => (changed.has(c.id) ? { ...c, surface: changed.get(c.id)! } : c)) };
  }
  if (config.out) await writeTable(config.out, changesTable(changes));
  if (config.refit) await writeFileAtomic(config.refit, formatModel(refitFile));
  if (config.writeFloor && newFloor) await writeFileAtomic(config.writeFloor, formatFloor(newFloor));
  const regionWarnings =
    config.writeFloor && unplaced.length
      ? [`compare: ${unplaced.length} reported change${unplaced.length === 1 ? '' : 's'} could be at any of several cells the runs cannot tell apart and ${unplaced.length === 1 ? 'is' : 'are'} not written to ${config.writeFloor}; inspect: ${unplaced.slice(0, 5).map((r) => `${r.region} (${r.cells.join(';')})`).join(', ')}${unplaced.length > 5 ? `, and ${unplaced.length - 5} more` : ''}`]
      : [];
  return {
    changes,
    regions,
    nRegionsChanged: reported.length,
    nPlaced: placed.size,
    unplaced,
    nChanged: changes.filter((c) => c.verdict === 'changed').length,
    nTested: changes.filter((c) => c.verdict !== 'too-few-readings').length,
    nTooFew: changes.filter((c) => c.verdict === 'too-few-readings').length,
    runs,
    beforePerReading: before,
    afterPerReading: after,
    refit: refitFile,
    inflation,
    nullDraws: config.nullDraws,
    options: config.compare,
    newFloor,
    warnings: withOdometry.movement && !useOdometry
      ? [...loaded.warnings, ...wasmFallbackWarning(), ...regionWarnings, `compare: the odometry columns (${[withOdometry.movement.movedCol, withOdometry.movement.headingCol].filter((c) => c).join(', ')}) are ignored: the old model has no movement parameters`]
      : [...loaded.warnings, ...wasmFallbackWarning(), ...regionWarnings],
  };
}

/**
 * The re-fitted model's provenance, in the model file's `fit` record: every candidate start as a
 * restart (restart 0 the plain warm start, then one per robust phase), the selected one, the EM loop
 * after the last kept swap as the final pass, and the expected readings per cell.
 */
function refitRecord(
  found: RefitSearchResult,
  countsT: Float64Array,
  nReadings: number,
  n: number,
  m: number,
  o: { floorDigest: string; runsDigests: Array<{ file: string; sha256: string }>; options: FitOptions; runIds: string[]; startDwell: number },
): FitRecord {
  const loopRecord = (res: EmLoopResult): LoopRecord => ({
    seed: o.options.seed,
    iterations: res.iterations,
    stopReason: res.stopReason,
    history: res.history,
    trainLogLikPerReading: res.logLikPerReading,
    heldOutLogLikPerReading: null,
    startDwell: o.startDwell,
  });
  return {
    tool: 'underfoot',
    toolVersion: TOOL_VERSION,
    floorDigest: o.floorDigest,
    runsDigests: o.runsDigests,
    options: { ...o.options, restarts: found.candidates.length, holdout: 0, holdoutCol: null, finalPass: found.finalLoop !== null },
    split: { fit: o.runIds, heldOut: [] },
    nReadings: { fit: nReadings, heldOut: 0 },
    restarts: found.candidates.map((c) => loopRecord(c.loop)),
    selected: found.selected,
    selectedBy: 'training',
    finalPass: found.finalLoop ? loopRecord(found.finalLoop) : null,
    cellReadings: Array.from({ length: n }, (_, i) => Array.from({ length: m }, (_, r) => countsT[r * n + i])),
  };
}



/** Seed of null draw `b` (1-based), from the re-fit's seed. */
function nullDrawSeed(seed: number, b: number): number {
  return (Math.imul(seed + 1, 0x9e3779b1) + b) >>> 0;
}

/** The old fit's expected readings (readings × cells), when the model file recorded them. */
function oldCountsT(file: ModelFile): Float64Array | null {
  const rows = file.fit?.cellReadings;
  const n = file.model.cells.length;
  const m = file.model.surfaces.length;
  if (!Array.isArray(rows) || rows.length !== n || !rows.every((r) => Array.isArray(r) && r.length === m && r.every((v) => Number.isFinite(v) && v >= 0))) return null;
  const t = new Float64Array(n * m);
  rows.forEach((row, i) => row.forEach((v, r) => (t[r * n + i] = v)));
  return t;
}

function scoreShift(oldModel: HmmModel, newModel: HmmModel, runs: ReadonlyArray<{ id: string; obs: Int32Array; moves?: MoveSteps }>): RunShift[] {
  const a = chainFromModel(oldModel);
  const b = chainFromModel(newModel);
  const work = new Float64Array(2 * a.nCells);
  const score = (chain: SparseChain, r: (typeof runs)[number]): number => {
    if (!chain.move || !r.moves) return forwardScore(chain, r.obs, r.obs.length, work);
    const T = r.obs.length;
    return forwardMoveSegment(chain, chain.move, r.obs, r.moves, 0, T, new Float64Array((T + 1) * chain.nCells), new Float64Array(T), 0, work);
  };
  return runs.map((r) => {
    let readings = 0;
    for (let t = 0; t < r.obs.length; t++) if (r.obs[t] >= 0) readings++;
    return { run: r.id, readings, before: score(a, r), after: score(b, r) };
  });
}

/**
 * The changes table: `cell`, `surface_before`, `surface_after`, `expected_readings`, `tv_distance`,
 * `g_stat`, `p_value` (the cell's own test), `q_value` and `verdict` (its region's), `region` (shared by
 * the cells of one reported change), `candidates` (the region's cells, `;`-separated), `explanation` (one
 * plain sentence: what the cell reads now and before, and why it is flagged).
 */
export function changesTable(changes: CellChange[]): OutputTable {
  return {
    nRows: changes.length,
    columns: [
      { name: 'cell', kind: 'utf8', get: (r) => changes[r].cell },
      { name: 'surface_before', kind: 'utf8', get: (r) => changes[r].surfaceBefore },
      { name: 'surface_after', kind: 'utf8', get: (r) => changes[r].surfaceAfter },
      { name: 'expected_readings', kind: 'float64', get: (r) => changes[r].expectedReadings },
      { name: 'tv_distance', kind: 'float64', get: (r) => changes[r].tvDistance },
      { name: 'g_stat', kind: 'float64', get: (r) => changes[r].gStat }, // Infinity when the old row forbade a reading now seen
      { name: 'p_value', kind: 'float64', get: (r) => changes[r].pValue },
      { name: 'q_value', kind: 'float64', get: (r) => changes[r].qValue },
      { name: 'verdict', kind: 'utf8', get: (r) => changes[r].verdict },
      { name: 'region', kind: 'utf8', get: (r) => changes[r].region },
      { name: 'candidates', kind: 'utf8', get: (r) => changes[r].candidates.join(';') },
      { name: 'explanation', kind: 'utf8', get: (r) => changes[r].explanation },
    ],
  };
}

