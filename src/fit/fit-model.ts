import type { FloorGraph } from '../model/floor-graph.js';
import type { HmmModel } from '../model/hmm-model.js';
import { buildModel } from '../model/build-model.js';
import { surveyPrior } from '../model/survey-prior.js';
import { equalSplitTransitions } from '../model/equal-split-transitions.js';
import { WorkError } from '../errors.js';
import { packRuns, type PackedRuns } from './packed-runs.js';
import { splitRuns } from './split-runs.js';
import { restartSeeds } from './restart-seeds.js';
import { startingPoint } from './starting-point.js';
import { runEm, type EmLoopOptions } from './em-loop.js';
import { impossibleRunError } from './impossible-run-error.js';
import type { EStepEngine } from './e-step-engine.js';
import { LocalEngine } from './local-engine.js';
import { PoolEngine } from './pool-engine.js';
import type { FitOptions, FitRecord, LoopRecord } from './fit-record.js';
import { TOOL_VERSION } from '../version.js';
import { selectRestart } from './select-restart.js';
import { reduceBlocks } from './reduce-blocks.js';

export interface FitInput {
  floor: FloorGraph;
  runs: ReadonlyArray<{ id: string; obs: Int32Array }>;
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

export const DEFAULT_FIT_OPTIONS: FitOptions = {
  restarts: 8,
  holdout: 0.2,
  holdoutCol: null,
  seed: 1,
  transitions: 'tied',
  dwell: 0.5,
  hit: 0.8,
  priorStrength: 10,
  maxIter: 200,
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
export async function fitModel(
  input: FitInput,
  options: FitOptions,
  workers: number,
  onProgress?: (p: FitProgress) => void,
): Promise<FitResult> {
  const o = options;
  const { floor, runs } = input;
  if (runs.length === 0) throw new WorkError('fit: there must be at least one run, got none');
  const split = splitRuns(runs.length, o.holdout, o.seed, input.heldOutFlags);
  if (split.fit.length === 0) throw new WorkError('fit: at least one run must be left to fit on, got every run held out');
  const packed = packRuns(runs, workers > 1);
  const base = input.warmStart ? intoFamily(input.warmStart, o) : buildModel(floor, { dwell: o.dwell, hit: o.hit });
  const surfaceIndex = new Map(floor.surfaces.map((s, r) => [s, r] as const));
  const prior = input.prior ?? surveyPrior(Int32Array.from(floor.cells, (c) => surfaceIndex.get(c.surface) ?? 0), floor.surfaces.length, o.hit);
  const loopOptions: EmLoopOptions = { mode: o.transitions, priorStrength: o.priorStrength, prior, maxIter: o.maxIter, tol: o.tol };
  const fitBlocks = toBlocks(split.fit, o.blockSize);
  const heldBlocks = toBlocks(split.heldOut, o.blockSize);
  const allBlocks = toBlocks(Array.from({ length: runs.length }, (_, r) => r), o.blockSize);
  const engine: EStepEngine = workers > 1 ? new PoolEngine(packed, workers) : new LocalEngine(packed);
  try {
    const seeds = restartSeeds(o.seed, o.restarts);
    const restarts: LoopRecord[] = [];
    const models: HmmModel[] = [];
    for (let k = 0; k < o.restarts; k++) {
      const { model: start, dwell } = startingPoint(base, o.transitions, k, seeds[k]);
      const res = await runEm(engine, packed, start, fitBlocks, loopOptions, (iteration, objectivePerReading) =>
        onProgress?.({ phase: 'restart', restart: k, restarts: o.restarts, iteration, objectivePerReading }),
      );
      const held = heldBlocks.length ? await scoreBlocks(engine, packed, res.model, heldBlocks) : null;
      restarts.push({
        seed: seeds[k],
        iterations: res.iterations,
        stopReason: res.stopReason,
        history: res.history,
        trainLogLikPerReading: res.logLikPerReading,
        heldOutLogLikPerReading: held,
        startDwell: dwell,
      });
      models.push(res.model);
    }
    const byHeldOut = split.heldOut.length > 0;
    const selected = selectRestart(restarts, byHeldOut);
    let model = models[selected];
    let finalPass: LoopRecord | null = null;
    if (o.finalPass) {
      const res = await runEm(engine, packed, model, allBlocks, loopOptions, (iteration, objectivePerReading) =>
        onProgress?.({ phase: 'final', restart: selected, restarts: o.restarts, iteration, objectivePerReading }),
      );
      model = res.model;
      finalPass = {
        seed: seeds[selected],
        iterations: res.iterations,
        stopReason: res.stopReason,
        history: res.history,
        trainLogLikPerReading: res.logLikPerReading,
        heldOutLogLikPerReading: null,
        startDwell: restarts[selected].startDwell,
      };
    }
    const cellReadings = await finalCounts(engine, packed, model, allBlocks);
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
    };
    return { model, record };
  } finally {
    await engine.close();
  }
}

/** Expected readings per cell and surface over all runs under `model` (one more E-step). */
async function finalCounts(engine: EStepEngine, packed: PackedRuns, model: HmmModel, blocks: number[][]): Promise<number[][]> {
  const counts = reduceBlocks(model, packed, await engine.counts(model, blocks));
  const n = model.cells.length;
  const m = model.surfaces.length;
  return model.cells.map((_, i) => Array.from({ length: m }, (_, r) => counts.emitT[r * n + i]));
}

function toBlocks(indices: number[], size: number): number[][] {
  const blocks: number[][] = [];
  for (let a = 0; a < indices.length; a += size) blocks.push(indices.slice(a, a + size));
  return blocks;
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

/** A warm-start model moved into the transition family of the mode (tied: one dwell, equal split). */
function intoFamily(model: HmmModel, o: FitOptions): HmmModel {
  if (o.transitions !== 'tied') return model;
  const s = model.structure;
  let sum = 0;
  let n = 0;
  for (let i = 0; i < s.nCells; i++) {
    if (s.succPtr[i + 1] - s.succPtr[i] > 1) {
      sum += model.trans[s.dwellPos[i]];
      n++;
    }
  }
  return { ...model, trans: equalSplitTransitions(s, n ? sum / n : o.dwell) };
}
