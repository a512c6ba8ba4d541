import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { sampleRun } from '../model/sample-run.js';
import { SeededRandom } from '../model/seeded-random.js';
import { forwardScaled } from '../kernels/forward-scaled.js';
import { backwardScaled } from '../kernels/backward-scaled.js';
import { posteriorMarginals } from '../kernels/posterior-marginals.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { backwardMoveScaled } from '../kernels/backward-move-scaled.js';
import { sampleOdometry } from '../model/sample-odometry.js';
import { moveStepsFromOdometry } from '../model/move-steps-from-odometry.js';

export interface AmbiguityOptions {
  /** Simulated runs. @default 100 */
  runs: number;
  /** Steps per simulated run. @default 400 */
  steps: number;
  /** Seed of the simulation. @default 1 */
  seed: number;
  /** Share of readings replaced by dropouts, as in the real runs. @default 0 */
  dropoutRate: number;
  /** A cell whose recovery is below this is ambiguous. @default 0.5 */
  threshold: number;
  /** Cells visited fewer times than this are not rated. @default 20 */
  minVisits: number;
  /** Metres added to the planar distance per level of difference (for the expected position error). @default 5 */
  levelGapM: number;
}

export const DEFAULT_AMBIGUITY_OPTIONS: AmbiguityOptions = {
  runs: 100,
  steps: 400,
  seed: 1,
  dropoutRate: 0,
  threshold: 0.5,
  minVisits: 20,
  levelGapM: 5,
};

/** Per cell (index = cell), estimated from simulated runs. Rates are NaN for cells never visited. */
export interface AmbiguityEstimate {
  options: AmbiguityOptions;
  /** Simulated steps spent in each cell. */
  visits: Float64Array;
  /** Mean posterior probability of the true cell while the robot is in it: how often decoding recovers it. */
  recovery: Float64Array;
  /** Mean posterior probability of the true cell or a cell one link away. */
  nearRecovery: Float64Array;
  /** Mean posterior-expected distance (m) between the decoded and the true cell. */
  errorM: Float64Array;
  /** The other cell holding the most posterior probability while the robot is in this one; -1 if none. */
  confusedWith: Int32Array;
  /** Mean posterior probability of `confusedWith` while the robot is in this cell (counting steps where it held ≥ 1 %). */
  confusedP: Float64Array;
  /** 1 for cells visited at least `minVisits` times whose recovery is below `threshold`. */
  ambiguous: Uint8Array;
  /** Simulated steps in all. */
  nSteps: number;
  /** Per named zone (index into `zones`; empty when the model has no zones), the same figures for zones. */
  zones: ZoneAmbiguity[];
  /** True when the simulated runs carried wheel odometry and were decoded with the model's movement parameters. */
  odometry: boolean;
}

/** How well decoding recovers one zone: the mean posterior of the true zone while the robot is in it. */
export interface ZoneAmbiguity {
  zone: string;
  /** Cells of the zone. */
  cells: number;
  /** Simulated steps spent in the zone. */
  visits: number;
  /** Mean posterior probability of the zone (summed over its cells) while the robot is in it; NaN if never visited. */
  recovery: number;
  /** Visit-weighted mean recovery of the zone's cells (cell level, for comparison). */
  cellRecovery: number;
  /** The other zone holding the most posterior while the robot is in this one; -1 if none. */
  confusedWith: number;
  /** Mean posterior of `confusedWith` while the robot is in this zone. */
  confusedP: number;
  /** 1 when visited at least `minVisits` times and recovered less than `threshold`. */
  ambiguous: boolean;
}

/** Posterior probabilities below this are not tallied as confusions (keeps the tally sparse). */
const CONFUSION_FLOOR = 0.01;

/**
 * Localization ambiguity of every cell, by simulation: `runs` runs of `steps` steps are drawn from the
 * model (start, transitions and emissions as fitted, readings dropped at `dropoutRate`), each run is
 * decoded with the scaled forward-backward recursions (Rabiner 1989, eqs. 18–27 with section V.A
 * scaling) into posterior marginals γ_t(j) = P(cell j at t | all readings), and for every step the
 * posterior of the true cell is tallied. A cell's recovery is the mean of γ_t(true) over the steps spent
 * in it: the probability that a decoder reading the posterior puts the robot in the right cell. Unlike
 * counting argmax hits it needs no tie-breaking, so two mirror-image rooms score alike (about ½ each).
 * When the model has movement parameters (it was fitted on runs with wheel odometry), every simulated
 * run also gets odometry (`sampleOdometry`, from a generator of its own) and is decoded with the
 * per-step transitions, as the real runs are: the figures then say what decoding with odometry recovers.
 * Deterministic for a given model and options.
 */
export function estimateAmbiguity(model: HmmModel, options: Partial<AmbiguityOptions> = {}): AmbiguityEstimate {
  const o: AmbiguityOptions = { ...DEFAULT_AMBIGUITY_OPTIONS, ...options };
  const chain = chainFromModel(model);
  const n = chain.nCells;
  const T = Math.max(1, Math.floor(o.steps));
  const s = model.structure;
  const visits = new Float64Array(n);
  const recoverySum = new Float64Array(n);
  const nearSum = new Float64Array(n);
  const errorSum = new Float64Array(n);
  const confusion: Array<Map<number, number>> = Array.from({ length: n }, () => new Map());
  // Planar coordinates and levels, for the expected distance.
  const xs = Float64Array.from(model.cells, (c) => c.x);
  const ys = Float64Array.from(model.cells, (c) => c.y);
  const levels = Float64Array.from(model.cells, (c) => c.level);
  // Neighbours one link away in either direction (CSR successors and CSC predecessors), plus the cell.
  const near: Int32Array[] = [];
  for (let i = 0; i < n; i++) {
    const set = new Set<number>([i]);
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) set.add(s.succIdx[k]);
    for (let k = s.predPtr[i]; k < s.predPtr[i + 1]; k++) set.add(s.predIdx[k]);
    near.push(Int32Array.from(set));
  }
  const alpha = new Float64Array(n * T);
  const beta = new Float64Array(n * T);
  const gamma = new Float64Array(n * T);
  const scale = new Float64Array(T);
  // Named zones: index per cell (-1 without a zone).
  const zoneNames = [...new Set(model.cells.flatMap((c) => (c.zone === undefined ? [] : [c.zone])))];
  const zoneIndex = new Map(zoneNames.map((z, k) => [z, k] as const));
  const zoneOf = Int32Array.from(model.cells, (c) => (c.zone === undefined ? -1 : (zoneIndex.get(c.zone) as number)));
  const nZones = zoneNames.length;
  const zoneMass = new Float64Array(nZones);
  const zoneVisits = new Float64Array(nZones);
  const zoneRecoverySum = new Float64Array(nZones);
  const zoneCellRecoverySum = new Float64Array(nZones);
  const zoneConfusion = new Float64Array(nZones * nZones);
  const rng = new SeededRandom(o.seed);
  const move = chain.move;
  // Odometry draws come from a generator of their own, so the walks are the same with or without it.
  const odometryRng = new SeededRandom(o.seed + 1_000_003);
  const moveTable = move ? new Float64Array((T + 1) * n) : alpha;
  const moveWork = move ? new Float64Array(2 * n) : alpha;
  let nSteps = 0;
  for (let r = 0; r < o.runs; r++) {
    const { cells, obs } = sampleRun(model, T, rng, o.dropoutRate);
    if (move) {
      const { moved, heading } = sampleOdometry(model, cells, odometryRng);
      const steps = moveStepsFromOdometry(moved, heading);
      const logLik = forwardMoveSegment(chain, move, obs, steps, 0, T, moveTable, scale, 0, moveWork);
      if (!Number.isFinite(logLik)) continue;
      backwardMoveScaled(chain, move, obs, steps, T, scale, beta);
      // α̂_t = c_t u_t, with u_t in row t + 1 of the forward table.
      for (let t = 0; t < T; t++) {
        const c = scale[t];
        for (let j = 0; j < n; j++) gamma[t * n + j] = c * moveTable[(t + 1) * n + j] * beta[t * n + j];
      }
    } else {
      const logLik = forwardScaled(chain, obs, T, alpha, scale);
      if (!Number.isFinite(logLik)) continue; // cannot happen for a run drawn from the model itself
      backwardScaled(chain, obs, T, scale, beta);
      posteriorMarginals(n, T, alpha, beta, gamma);
    }
    for (let t = 0; t < T; t++) {
      const row = t * n;
      const truth = cells[t];
      visits[truth]++;
      recoverySum[truth] += gamma[row + truth];
      const nb = near[truth];
      for (let k = 0; k < nb.length; k++) nearSum[truth] += gamma[row + nb[k]];
      const tx = xs[truth];
      const ty = ys[truth];
      const tl = levels[truth];
      let err = 0;
      const tally = confusion[truth];
      zoneMass.fill(0);
      for (let j = 0; j < n; j++) {
        const g = gamma[row + j];
        if (g === 0) continue;
        if (zoneOf[j] >= 0) zoneMass[zoneOf[j]] += g;
        const dx = xs[j] - tx;
        const dy = ys[j] - ty;
        err += g * (Math.sqrt(dx * dx + dy * dy) + Math.abs(levels[j] - tl) * o.levelGapM);
        if (g >= CONFUSION_FLOOR && j !== truth) tally.set(j, (tally.get(j) ?? 0) + g);
      }
      errorSum[truth] += err;
      const tz = zoneOf[truth];
      if (tz >= 0) {
        zoneVisits[tz]++;
        zoneRecoverySum[tz] += zoneMass[tz];
        zoneCellRecoverySum[tz] += gamma[row + truth];
        for (let z = 0; z < nZones; z++) zoneConfusion[tz * nZones + z] += zoneMass[z];
      }
    }
    nSteps += T;
  }
  const recovery = new Float64Array(n);
  const nearRecovery = new Float64Array(n);
  const errorM = new Float64Array(n);
  const confusedWith = new Int32Array(n).fill(-1);
  const confusedP = new Float64Array(n);
  const ambiguous = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const v = visits[i];
    recovery[i] = v > 0 ? recoverySum[i] / v : NaN;
    nearRecovery[i] = v > 0 ? nearSum[i] / v : NaN;
    errorM[i] = v > 0 ? errorSum[i] / v : NaN;
    let best = -1;
    let bestMass = 0;
    for (const [j, mass] of confusion[i]) {
      if (mass > bestMass || (mass === bestMass && j < best)) {
        best = j;
        bestMass = mass;
      }
    }
    confusedWith[i] = best;
    confusedP[i] = v > 0 ? bestMass / v : NaN;
    ambiguous[i] = v >= o.minVisits && recovery[i] < o.threshold ? 1 : 0;
  }
  const zones = zoneNames.map((zone, z): ZoneAmbiguity => {
    const v = zoneVisits[z];
    let best = -1;
    let bestMass = 0;
    for (let w = 0; w < nZones; w++) {
      if (w !== z && zoneConfusion[z * nZones + w] > bestMass) {
        best = w;
        bestMass = zoneConfusion[z * nZones + w];
      }
    }
    const rec = v > 0 ? zoneRecoverySum[z] / v : NaN;
    return {
      zone,
      cells: model.cells.filter((c) => c.zone === zone).length,
      visits: v,
      recovery: rec,
      cellRecovery: v > 0 ? zoneCellRecoverySum[z] / v : NaN,
      confusedWith: best,
      confusedP: v > 0 ? bestMass / v : NaN,
      ambiguous: v >= o.minVisits && rec < o.threshold,
    };
  });
  return { options: o, visits, recovery, nearRecovery, errorM, confusedWith, confusedP, ambiguous, nSteps, zones, odometry: move !== undefined };
}
