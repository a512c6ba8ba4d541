import type { HmmModel } from '../model/hmm-model.js';
import { maximizeModel } from '../model/maximize-model.js';
import type { EmLoopOptions, EmLoopResult } from '../fit/em-loop.js';
import { runSquarem } from '../fit/squarem-loop.js';
import type { EStepEngine } from '../fit/e-step-engine.js';
import type { PackedRuns } from '../fit/packed-runs.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { reduceBlocks } from '../fit/reduce-blocks.js';
import { refitStartRows, type RefitStart } from './refit-start-rows.js';

export type { RefitStart } from './refit-start-rows.js';

/** How `compare` looks for the re-fit (all fixed: the null draws repeat exactly the same search). */
export interface RefitSearchOptions {
  /** The EM loop: transition mode, prior centred on the old rows, iteration limit and tolerance. */
  loop: EmLoopOptions;
  /** ε of each robust phase; each gives one more candidate start. [] = plain warm start only. */
  robust: number[];
  /** EM iterations of each robust phase. */
  robustIterations: number;
  /** Rounds of the swap search (0 = none). */
  swapRounds: number;
  /** EM iterations that score one swap proposal. */
  swapIterations: number;
  /** A cell whose row moved this far (total variation) from its old row counts as moved. */
  moved: number;
  /** At most this many moved cells (the farthest) are tried per round. */
  maxMoved: number;
  /** Look-alike cells are looked for within this many links of a moved cell. */
  radius: number;
  /**
   * Fresh candidate starts besides the old model (`refit-starts.ts`): `survey` (every cell reads its
   * surveyed surface at the old rows' mean hit rate) and `sensor` (every cell takes the mean old row of
   * the cells surveyed with its surface). [] = none.
   */
  starts: RefitStart[];
}


export const DEFAULT_REFIT_SEARCH: Omit<RefitSearchOptions, 'loop'> = {
  robust: [0.5, 0.8],
  robustIterations: 40,
  swapRounds: 4,
  swapIterations: 20,
  moved: 0.3,
  maxMoved: 8,
  radius: 2,
  starts: ['survey', 'sensor'],
};

/** One candidate start's EM loop. */
export interface RefitCandidate {
  /** ε of its robust phase (0 = plain warm start from the old model, or a fresh start). */
  robust: number;
  /** Its emission rows at the start: the old model's (`old`), or a fresh start. */
  start: 'old' | RefitStart;
  loop: EmLoopResult;
}

/** A swap the search kept: `to` took over the change first credited to `from`. */
export interface RefitSwap {
  from: number;
  to: number;
  /** Rise of the objective (log-likelihood + log prior, summed over readings). */
  gain: number;
}

export interface RefitSearchResult {
  model: HmmModel;
  /** Expected counts of the runs under `model` (the E-step of its last EM loop). */
  counts: ExpectedCountsTable;
  candidates: RefitCandidate[];
  /** Index into `candidates` of the one the search continued from (highest objective). */
  selected: number;
  swaps: RefitSwap[];
  /** The EM loop after the last kept swap (null when no swap was kept). */
  finalLoop: EmLoopResult | null;
  objectivePerReading: number;
}

/** Progress of the search: which stage, and the EM loop's iteration and objective. */
export interface RefitSearchProgress {
  stage: 'plain' | 'robust' | 'fresh' | 'swap';
  robust: number;
  iteration: number;
  objectivePerReading: number;
}

/**
 * The re-fit of `compare`: EM warm-started from the old model can stop in a local optimum where a
 * changed cell keeps its old row and look-alike neighbours absorb its new readings (the runs are
 * explained by the robot being elsewhere). Three things guard against that, all deterministic:
 *
 * 1. Candidate starts. Besides the plain warm start, one per ε in `robust`: EM iterations whose E-step
 *    treats every reading as uninformative with probability ε (each row mixed with the uniform row,
 *    b̃ = (1 − ε)·b + ε/M), so positions follow the floor's links more than the old rows; then plain
 *    EM to convergence. The candidate with the highest objective wins (a continuation method: a
 *    smoothed likelihood first, the exact one after).
 *    Fresh starts (`starts`): EM from rows that forget what the old fit learned cell by cell — the
 *    survey's surfaces, or the old sensor's mean row per surveyed surface — as `fit`'s restarts do.
 *    Where every reading fits many places, the old rows hold the runs in the old explanation: on the
 *    repeating floor of bench/compare-fdr.ts, a re-floored 2 × 2 block stayed credited to cells
 *    elsewhere from every warm start (40 log-likelihood units below EM from the true rows, decoding
 *    30 % of steps within 1.5 m against 61 %), while EM from the survey reached the true optimum.
 * 2. Swap search. A cell whose row moved far from its old row marks a change, but possibly at the wrong
 *    cell: for each such cell, give its new row to each nearby cell that read the same in the old
 *    model (and its old row back — or, when that cell moved too, exchange the two new rows), score by a
 *    short EM, continue the best to convergence, keep it when the objective rises. Repeat for
 *    `swapRounds` rounds. (Also spreading the new row to a look-alike
 *    was tried: on the demo it doubled the search's cost for a log-likelihood gain of about 2.)
 * 3. Every comparison is on the EM objective (log-likelihood + emission log prior) of the same runs.
 *
 * Every EM loop is accelerated by SQUAREM (`runSquarem`), which reaches the same kind of fixed point in
 * far fewer E-steps; the robust phases are plain EM (their E-step is not the EM of the final objective).
 */
export async function searchRefit(
  engine: EStepEngine,
  packed: PackedRuns,
  blocks: number[][],
  old: HmmModel,
  options: RefitSearchOptions,
  onProgress?: (p: RefitSearchProgress) => void,
): Promise<RefitSearchResult> {
  const m = old.surfaces.length;
  const n = old.cells.length;
  const loop = options.loop;
  // Every EM loop here is accelerated (SQUAREM): the search runs many of them.
  const em = (start: HmmModel, stage: RefitSearchProgress['stage'], robust: number, limits: Partial<EmLoopOptions> = {}) =>
    runSquarem(engine, packed, start, blocks, { ...loop, ...limits }, onProgress ? (iteration, objectivePerReading) => onProgress({ stage, robust, iteration, objectivePerReading }) : undefined);
  const last = (res: EmLoopResult): number => res.history[res.history.length - 1];

  const candidates: RefitCandidate[] = [];
  for (const eps of [0, ...options.robust]) {
    let start = old;
    if (eps > 0) {
      for (let it = 0; it < options.robustIterations; it++) {
        const mixed: HmmModel = { ...start, emission: mixUniform(start.emission, eps, m) };
        const counts = reduceBlocks(mixed, packed, await engine.counts(mixed, blocks));
        onProgress?.({ stage: 'robust', robust: eps, iteration: it, objectivePerReading: counts.logLik / Math.max(1, counts.nReadings) });
        start = maximizeModel(start, counts, { mode: loop.mode, priorStrength: loop.priorStrength, prior: loop.prior });
      }
    }
    candidates.push({ robust: eps, start: 'old', loop: await em(start, eps > 0 ? 'robust' : 'plain', eps) });
  }
  for (const kind of options.starts) {
    candidates.push({ robust: 0, start: kind, loop: await em({ ...old, emission: refitStartRows(old, kind) }, 'fresh', 0) });
  }
  const nReadings = Math.max(1, candidates[0].loop.counts.nReadings);
  let selected = 0;
  for (let k = 1; k < candidates.length; k++) if (last(candidates[k].loop) > last(candidates[selected].loop)) selected = k;
  let best = candidates[selected].loop.model;
  let bestCounts = candidates[selected].loop.counts;
  let bestObjective = last(candidates[selected].loop) * nReadings;
  let finalLoop: EmLoopResult | null = null;
  const swaps: RefitSwap[] = [];
  const adjacency = undirectedNeighbours(old);
  for (let round = 0; round < options.swapRounds; round++) {
    const moved = Array.from({ length: n }, (_, i) => ({ i, tv: tvDistance(best.emission, old.emission, i, m) }))
      .filter((c) => c.tv > options.moved)
      .sort((a, b) => b.tv - a.tv || a.i - b.i)
      .slice(0, options.maxMoved)
      .map((c) => c.i);
    const movedSet = new Set(moved);
    let top: { from: number; to: number; loop: EmLoopResult } | null = null;
    for (const from of moved) {
      const lookAlike = argmax(old.emission, from, m);
      for (const to of within(adjacency, from, options.radius)) {
        if (argmax(old.emission, to, m) !== lookAlike || (movedSet.has(to) && to < from)) continue;
        // `to` takes the new row of `from`; `from` gets `to`'s row back — its old row, or, when `to`
        // moved too, its new row (two changes credited the wrong way round).
        const emission = best.emission.slice();
        const source = movedSet.has(to) ? best.emission : old.emission;
        emission.set(source.subarray(to * m, (to + 1) * m), from * m);
        emission.set(best.emission.subarray(from * m, (from + 1) * m), to * m);
        const res = await em({ ...best, emission }, 'swap', 0, { maxIter: options.swapIterations, tol: 0 });
        if (!top || last(res) > last(top.loop)) top = { from, to, loop: res };
      }
    }
    if (!top) break;
    const res = await em(top.loop.model, 'swap', 0);
    const objective = last(res) * nReadings;
    if (!(objective > bestObjective + SWAP_MIN_GAIN)) break;
    swaps.push({ from: top.from, to: top.to, gain: objective - bestObjective });
    best = res.model;
    bestCounts = res.counts;
    bestObjective = objective;
    finalLoop = res;
  }
  return { model: best, counts: bestCounts, candidates, selected, swaps, finalLoop, objectivePerReading: bestObjective / nReadings };
}

/** A swap is kept only when it raises the objective by more than this (log-likelihood units). */
const SWAP_MIN_GAIN = 0.5;

function mixUniform(emission: Float64Array, eps: number, m: number): Float64Array {
  const out = new Float64Array(emission.length);
  for (let x = 0; x < emission.length; x++) out[x] = (1 - eps) * emission[x] + eps / m;
  return out;
}

function tvDistance(a: Float64Array, b: Float64Array, i: number, m: number): number {
  let d = 0;
  for (let r = 0; r < m; r++) d += Math.abs(a[i * m + r] - b[i * m + r]);
  return d / 2;
}

function argmax(e: Float64Array, i: number, m: number): number {
  let t = 0;
  for (let r = 1; r < m; r++) if (e[i * m + r] > e[i * m + t]) t = r;
  return t;
}

/** Each cell's neighbours along links in either direction (no self). */
function undirectedNeighbours(model: HmmModel): number[][] {
  const s = model.structure;
  const out: Array<Set<number>> = Array.from({ length: s.nCells }, () => new Set<number>());
  for (let i = 0; i < s.nCells; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      const j = s.succIdx[k];
      if (j !== i) {
        out[i].add(j);
        out[j].add(i);
      }
    }
  }
  return out.map((set) => [...set].sort((a, b) => a - b));
}

/** Cells within `radius` links of `i` (excluding `i`), nearest first, then by index. */
function within(adjacency: number[][], i: number, radius: number): number[] {
  const seen = new Set([i]);
  const found: number[] = [];
  let frontier = [i];
  for (let d = 0; d < radius; d++) {
    const next: number[] = [];
    for (const c of frontier) for (const j of adjacency[c]) if (!seen.has(j)) {
          seen.add(j);
          next.push(j);
        }
    next.sort((a, b) => a - b);
    found.push(...next);
    frontier = next;
  }
  return found;
}
