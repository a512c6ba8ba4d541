import type { MoveSteps } from '../kernels/move-chain.js';
import { DEFAULT_MOVEMENT } from '../model/default-movement.js';
import type { FloorGraph } from '../model/floor-graph.js';
import type { HmmModel } from '../model/hmm-model.js';
import { buildModel } from '../model/build-model.js';
import { surveyPrior } from '../model/survey-prior.js';
import { intoFamily } from '../model/into-family.js';
import { toBlocks } from './to-blocks.js';
import { WorkError } from '../errors.js';
import { packRuns, type PackedRuns } from './packed-runs.js';
import { splitRuns } from './split-runs.js';
import { restartSeeds } from './restart-seeds.js';
import { startingPoint } from './starting-point.js';
import { runEm, type EmLoopOptions, type EmLoopState } from './em-loop.js';
import type { CheckpointParams, CheckpointStore, FitCheckpoint } from './fit-checkpoint.js';
import { InputError } from '../errors.js';
import { createHash } from 'node:crypto';
import { checkCheckpoint } from './check-checkpoint.js';
import { impossibleRunError } from './impossible-run-error.js';
import type { EStepEngine } from './e-step-engine.js';
import { LocalEngine, type EngineOptions } from './local-engine.js';
import type { FitOptions, FitRecord, LoopRecord } from './fit-record.js';
import { TOOL_VERSION } from '../version.js';
import { selectRestart } from './select-restart.js';
import { reduceBlocks } from './reduce-blocks.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import type { TransitionMode } from '../model/hmm-model.js';
import { equalSplitTransitions } from '../model/equal-split-transitions.js';
import { autoCandidates, shareRestarts } from './auto-candidates.js';
import { predictiveCalibration } from './predictive-calibration.js';

export interface FitInput {
  floor: FloorGraph;
  runs: ReadonlyArray<{ id: string; obs: Int32Array; moves?: MoveSteps }>;
  /**
   * The runs carry odometry (`moves`): with `tied` and `fixed` transitions the model gets movement
   * parameters — the warm start's, or `DEFAULT_MOVEMENT` — learned (`tied`) or held (`fixed`); other
   * modes ignore the odometry (the caller warns). Without it the fit is exactly as before.
   */
  movement?: boolean;
  /** Per run, true when a `--holdout-col` marks it `held-out` (overrides the random fraction). */
  heldOutFlags?: boolean[];
  floorDigest: string;
  runsDigests: Array<{ file: string; sha256: string }>;
  /** Model to start from (`--from`), already checked against the floor. */
  warmStart?: HmmModel;
  /**
   * Centre of the emission prior, cells × readings (default: the survey prior from `hit`). `compare`
   * centres it on the old model's rows, so a re-fit moves only the cells whose new readings demand it.
   */
  prior?: Float64Array;
}

/** Progress events, for the CLI to draw; nothing here prints. */
export interface FitProgress {
  phase: 'restart' | 'final';
  restart: number;
  restarts: number;
  iteration: number;
  objectivePerReading: number;
}

export interface FitResult {
  model: HmmModel;
  record: FitRecord;
}

/**
 * Default pseudo-transitions per cell behind the `per-cell` and `learned` transition priors (chosen by
 * measurement on invented buildings with per-cell dwells and unequal links: DEVELOPERS.md).
 */
export const DEFAULT_TRANSITION_PRIOR_STRENGTH = 20;

export const DEFAULT_FIT_OPTIONS: FitOptions = {
  restarts: 8,
  holdout: 0.2,
  holdoutCol: null,
  seed: 1,
  transitions: 'auto',
  dwell: 0.5,
  hit: 0.8,
  priorStrength: 10,
  transitionPriorStrength: DEFAULT_TRANSITION_PRIOR_STRENGTH,
  maxIter: 1000,
  tol: 1e-6,
  finalPass: true,
  blockSize: 8,
  fromDigest: null,
};

/**
 * Calibrates a model: held-out split by whole runs; K restarts of EM on the fitted runs (restart 0 from
 * the survey prior or the warm start, the others drawn around it); selection by held-out log-likelihood
 * per reading (by training objective when nothing is held out); then a final pass continuing the chosen
 * model on all runs. E-steps run over fixed-size blocks of runs reduced in block order, so the result is
 * identical for any number of workers.
 */
export interface FitControl {
  /** Saves the fit's state after every iteration and resumes from it (`fit --checkpoint DIR`). */
  checkpoint?: CheckpointStore;
  /** Stops the fit after the current iteration (its checkpoint saved) with `InterruptedError`. */
  signal?: AbortSignal;
  /**
   * Everything else that shaped the data read (e.g. the runs tables' key columns and the unknown-readings
   * rule), as normalized text: part of the checkpoint's key, so a checkpoint is resumed only by the
   * same command. The runs' ids and readings as read are part of the key as well.
   */
  configKey?: string;
  /**
   * Makes the E-step engine instead of `LocalEngine`/`PoolEngine` (e.g. `fit --queue`: the fleet's
   * `QueueEngine`). It gets the packed runs and the engine options the fit chose; the fit closes it.
   */
  engine?: (packed: PackedRuns, options: EngineOptions) => EStepEngine;
}

export async function fitModel(
  input: FitInput,
  options: FitOptions,
  workers: number,
  onProgress?: (p: FitProgress) => void,
  control: FitControl = {},
): Promise<FitResult> {
  const o = options;
  const { floor, runs } = input;
  if (runs.length === 0) throw new WorkError('fit: there must be at least one run, got none');
  const split = splitRuns(runs.length, o.holdout, o.seed, input.heldOutFlags);
  if (split.fit.length === 0) throw new WorkError('fit: at least one run must be left to fit on, got every run held out');
  const modes: TransitionMode[] = o.transitions === 'auto' ? autoCandidates({ movement: input.movement === true }) : [o.transitions];
  // Odometry shapes the transitions of the `tied` and `fixed` modes only; other modes fit without it.
  const useMovement = input.movement === true && modes.every((mode) => mode === 'tied' || mode === 'fixed');
  const packed = packRuns(useMovement ? runs : runs.map(({ id, obs }) => ({ id, obs })), workers > 1 && !control.engine);
  const built = input.warmStart ? null : buildModel(floor, { dwell: o.dwell, hit: o.hit });
  // Restart 0 of each mode starts from the survey prior, or from the warm start brought into that mode's family.
  const baseOf = (mode: TransitionMode): HmmModel => {
    const { movement: warmMovement, ...withoutMovement } = built ?? intoFamily(input.warmStart!, mode, o.dwell);
    return useMovement ? { ...withoutMovement, movement: { ...(input.warmStart?.movement ?? warmMovement ?? DEFAULT_MOVEMENT) } } : withoutMovement;
  };
  const base = baseOf(modes[0]);
  const surfaceIndex = new Map(floor.surfaces.map((s, r) => [s, r] as const));
  const prior = input.prior ?? surveyPrior(Int32Array.from(floor.cells, (c) => surfaceIndex.get(c.surface) ?? 0), floor.surfaces.length, o.hit);
  const centre = equalSplitTransitions(base.structure, o.dwell);
  // A pruned E-step's objective may fall by up to twice its bound (Σ_t −log(1 − eps) per run,
  // DEVELOPERS.md "Pruned E-step") between iterations; the loop takes such a fall as convergence.
  const prune = o.prune ?? 0;
  const totalSteps = packed.offsets[packed.offsets.length - 1];
  const pruneSlack = prune > 0 ? { decreaseSlack: -2 * Math.log1p(-prune) * totalSteps } : {};
  const loopOptionsOf = (mode: TransitionMode): EmLoopOptions =>
    mode === 'per-cell' || mode === 'learned'
      ? { mode, priorStrength: o.priorStrength, prior, maxIter: o.maxIter, tol: o.tol, transitionPriorStrength: o.transitionPriorStrength ?? 0, transitionCentre: centre, projected: true, ...pruneSlack }
      : { mode, priorStrength: o.priorStrength, prior, maxIter: o.maxIter, tol: o.tol, ...pruneSlack };
  const fitBlocks = toBlocks(split.fit, o.blockSize);
  const heldBlocks = toBlocks(split.heldOut, o.blockSize);
  const allBlocks = toBlocks(Array.from({ length: runs.length }, (_, r) => r), o.blockSize);
  // One engine serves every candidate of `auto`: per-link counts (the `learned` form) fit every M-step.
  // With odometry the candidates are `fixed` and `tied`, whose totals form serves both.
  const engineMode: TransitionMode = modes.length > 1 ? (useMovement ? 'tied' : 'learned') : modes[0];
  // The thread pool (and its package) is loaded only for more than one thread (start-up time).
  const engine: EStepEngine = control.engine
    ? control.engine(packed, { mode: engineMode, prune })
    : workers > 1
      ? new (await import('./pool-engine.js')).PoolEngine(packed, workers, { mode: engineMode, prune })
      : new LocalEngine(packed, { mode: engineMode, prune });
  try {
    const plan = restartPlan(modes, o.restarts, o.seed);
    const restarts: LoopRecord[] = [];
    const models: HmmModel[] = [];
    const store = control.checkpoint;
    const key = store ? checkpointKey(input, o, control.configKey ?? '') : '';
    const saved = store ? await store.load() : null;
    if (saved && saved.key !== key) {
      throw new InputError(
        `${store!.where}: the checkpoint must have been made by the same fit (same floor, runs, columns and options), got one from another fit; remove it or choose another --checkpoint folder`,
      );
    }
    if (saved) checkCheckpoint(saved, base, o.restarts, o.maxIter, store!.where);
    const done: FitCheckpoint['done'] = saved ? saved.done.slice() : [];
    const save = (current: FitCheckpoint['current']): Promise<void> =>
      store ? store.save({ format: 'underfoot-fit-checkpoint/1', key, done, current }) : Promise.resolve();
    const loopHooks = (phase: 'restart' | 'final', k: number, start: HmmModel) => ({
      onIteration: (iteration: number, objectivePerReading: number) =>
        onProgress?.({ phase, restart: k, restarts: plan.length, iteration, objectivePerReading }),
      resume:
        saved?.current && saved.current.phase === phase && saved.current.index === k
          ? { model: withParams(start, saved.current.params), iterations: saved.current.iterations, history: saved.current.history }
          : undefined,
      afterStep: store
        ? (state: EmLoopState) => save({ phase, index: k, iterations: state.iterations, history: state.history, params: paramsOf(state.model) })
        : undefined,
      signal: control.signal,
    });
    for (let k = 0; k < plan.length; k++) {
      const { mode, index, seed } = plan[k];
      const { model: start, dwell } = startingPoint(baseOf(mode), mode, index, seed);
      if (k < done.length) {
        restarts.push(done[k].record);
        models.push(withParams(start, done[k].params));
        continue;
      }
      const res = await runEm(engine, packed, start, fitBlocks, loopOptionsOf(mode), loopHooks('restart', k, start));
      const held = heldBlocks.length ? await scoreBlocks(engine, packed, res.model, heldBlocks) : null;
      restarts.push({
        seed,
        iterations: res.iterations,
        stopReason: res.stopReason,
        history: res.history,
        trainLogLikPerReading: res.logLikPerReading,
        heldOutLogLikPerReading: held,
        startDwell: dwell,
        ...(modes.length > 1 ? { mode } : {}),
      });
      models.push(res.model);
      done.push({ record: restarts[k], params: paramsOf(res.model) });
      await save(null);
    }
    const byHeldOut = split.heldOut.length > 0;
    const selected = selectRestart(restarts, byHeldOut);
    const selectedMode = plan[selected].mode;
    const loopOptions = loopOptionsOf(selectedMode);
    const heldObs = split.heldOut.map((r) => packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]));
    // With odometry (and a model that uses it) each held-out run is forecast with its per-step transitions.
    const heldMoves = useMovement ? split.heldOut.map((r) => runs[r].moves) : undefined;
    const calibration = heldObs.length ? predictiveCalibration(models[selected], heldObs, undefined, heldMoves) : null;
    let model = models[selected];
    let finalPass: LoopRecord | null = null;
    let finalCounts: ExpectedCountsTable | null = null;
    if (o.finalPass) {
      const res = await runEm(engine, packed, model, allBlocks, loopOptions, loopHooks('final', selected, model));
      model = res.model;
      finalCounts = res.counts;
      finalPass = {
        seed: plan[selected].seed,
        iterations: res.iterations,
        stopReason: res.stopReason,
        history: res.history,
        trainLogLikPerReading: res.logLikPerReading,
        heldOutLogLikPerReading: null,
        startDwell: restarts[selected].startDwell,
        ...(modes.length > 1 ? { mode: selectedMode } : {}),
      };
    }
    // The final pass ends with an E-step of the returned model over all runs: its counts are the ones
    // to record. Without a final pass, one more E-step over all runs makes them.
    finalCounts ??= reduceBlocks(model, packed, await engine.counts(model, allBlocks));
    const cellReadings = readingsByCell(model, finalCounts);
    const count = (idx: number[]): number => idx.reduce((sum, r) => sum + countReadings(packed, r), 0);
    const record: FitRecord = {
      tool: 'underfoot',
      toolVersion: TOOL_VERSION,
      floorDigest: input.floorDigest,
      runsDigests: input.runsDigests,
      options: o,
      split: { fit: split.fit.map((r) => runs[r].id), heldOut: split.heldOut.map((r) => runs[r].id) },
      nReadings: { fit: count(split.fit), heldOut: count(split.heldOut) },
      restarts,
      selected,
      selectedBy: byHeldOut ? 'held-out' : 'training',
      finalPass,
      cellReadings,
      predictiveCalibration: calibration,
    };
    if (store) await store.clear();
    return { model, record };
  } finally {
    await engine.close();
  }
}

/** One EM loop of the fit: its transition mode, its index among that mode's restarts, its seed. */
interface PlannedRestart {
  mode: TransitionMode;
  index: number;
  seed: number;
}

/**
 * The restarts of a fit, in order: with one mode, `restarts` loops; with several (`auto`), the restarts
 * shared out among them (`shareRestarts`), mode by mode. Restart k of every mode uses the k-th seed, and
 * restart 0 of every mode starts from the survey prior (or the warm start).
 */
function restartPlan(modes: TransitionMode[], restarts: number, seed: number): PlannedRestart[] {
  const counts = modes.length > 1 ? shareRestarts(restarts, modes.length) : [restarts];
  const seeds = restartSeeds(seed, Math.max(...counts));
  return modes.flatMap((mode, c) => Array.from({ length: counts[c] }, (_, index) => ({ mode, index, seed: seeds[index] })));
}

/**
 * A key that changes whenever anything that shapes the numbers changes (checkpoints must match it): a
 * digest of the floor and runs files, every fit option, the caller's `configKey` (key columns, unknown
 * readings), the held-out flags, the warm start and prior, and the runs exactly as read (ids and
 * readings), so an option added later that changes what is read changes the key by itself.
 */
function checkpointKey(input: FitInput, o: FitOptions, configKey: string): string {
  const h = createHash('sha256');
  h.update(JSON.stringify({ floor: input.floorDigest, runs: input.runsDigests.map((r) => r.sha256), options: o, nRuns: input.runs.length, config: configKey }));
  h.update(JSON.stringify(input.heldOutFlags ?? null));
  for (const a of [input.warmStart?.start, input.warmStart?.trans, input.warmStart?.emission, input.prior]) {
    h.update(a ? new Uint8Array(a.buffer, a.byteOffset, a.byteLength) : new Uint8Array(0));
  }
  for (const run of input.runs) {
    h.update(JSON.stringify(run.id));
    h.update(new Uint8Array(run.obs.buffer, run.obs.byteOffset, run.obs.byteLength));
  }
  return `sha256:${h.digest('hex')}`;
}

function paramsOf(model: HmmModel): CheckpointParams {
  const params: CheckpointParams = { start: Array.from(model.start), trans: Array.from(model.trans), emission: Array.from(model.emission) };
  if (model.movement) params.movement = { ...model.movement };
  return params;
}

function withParams(model: HmmModel, p: CheckpointParams): HmmModel {
  const out: HmmModel = { ...model, start: Float64Array.from(p.start), trans: Float64Array.from(p.trans), emission: Float64Array.from(p.emission) };
  if (p.movement) out.movement = { ...p.movement };
  return out;
}

/** Expected readings per cell (rows) and surface (columns), from counts over all runs under `model`. */
function readingsByCell(model: HmmModel, counts: ExpectedCountsTable): number[][] {
  const n = model.cells.length;
  const m = model.surfaces.length;
  return model.cells.map((_, i) => Array.from({ length: m }, (_, r) => counts.emitT[r * n + i]));
}


async function scoreBlocks(engine: EStepEngine, packed: PackedRuns, model: HmmModel, blocks: number[][]): Promise<number> {
  let logLik = 0;
  let n = 0;
  for (const b of await engine.score(model, blocks)) {
    if (b.impossibleRun >= 0) {
      const r = b.impossibleRun;
      throw impossibleRunError(model, { id: packed.ids[r], obs: packed.obs.subarray(packed.offsets[r], packed.offsets[r + 1]) });
    }
    logLik += b.logLik;
    n += b.nReadings;
  }
  return logLik / Math.max(1, n);
}

function countReadings(packed: PackedRuns, r: number): number {
  let n = 0;
  for (let t = packed.offsets[r]; t < packed.offsets[r + 1]; t++) if (packed.obs[t] >= 0) n++;
  return n;
}

