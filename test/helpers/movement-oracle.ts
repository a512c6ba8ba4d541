import type { HmmModel } from '../../src/model/hmm-model.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { randomModel } from './random-model.js';

/**
 * Brute-force oracle for per-step transitions from odometry, written from the definition in
 * DEVELOPERS.md ("Movement") and independent of the kernels' tables: the dense transition matrix of one
 * step, and every path's probability by explicit enumeration.
 */
export function denseMoveTransition(model: HmmModel, dBin: number, hBin: number): number[][] {
  const s = model.structure;
  const n = s.nCells;
  const mv = model.movement!;
  const a = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n; i++) {
    let dwell = 0;
    const links: Array<[number, number]> = [];
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      if (s.succIdx[k] === i) dwell = model.trans[k];
      else links.push([s.succIdx[k], model.trans[k]]);
    }
    const d = dBin * 0.01;
    const stay = dBin >= 0 && dwell > 0 && dwell < 1 ? 1 / (1 + Math.exp(-(mv.stayLogit - mv.stayPerMetre * d))) : dwell;
    a[i][i] = stay;
    const h = ((hBin + 0.5) * 5 * Math.PI) / 180;
    const weights = links.map(([j, p]) => {
      if (hBin < 0) return p;
      const ci = model.cells[i];
      const cj = model.cells[j];
      const flat = ci.level === cj.level && (ci.x !== cj.x || ci.y !== cj.y);
      return p * (flat ? Math.exp(mv.kappa * Math.cos(h - Math.atan2(cj.y - ci.y, cj.x - ci.x))) : 1);
    });
    const total = weights.reduce((x, y) => x + y, 0);
    links.forEach(([j], q) => (a[i][j] = total > 0 ? ((1 - stay) * weights[q]) / total : 0));
  }
  return a;
}

export interface Enumeration {
  total: number;
  best: number;
  second: number;
  bestPath: number[];
  /** Posterior of each cell at each step, T × n. */
  gamma: number[][];
  /** Expected transitions i → j into each step t (t ≥ 1), T × n × n (row 0 zero). */
  xi: number[][][];
}

export function enumerateMovePaths(model: HmmModel, obs: number[], dBin: number[], hBin: number[]): Enumeration {
  const n = model.cells.length;
  const m = model.surfaces.length;
  const T = obs.length;
  const A = Array.from({ length: T }, (_, t) => (t === 0 ? [] : denseMoveTransition(model, dBin[t], hBin[t])));
  const gamma = Array.from({ length: T }, () => new Array<number>(n).fill(0));
  const xi = Array.from({ length: T }, () => Array.from({ length: n }, () => new Array<number>(n).fill(0)));
  let total = 0;
  let best = -1;
  let second = -1;
  let bestPath: number[] = [];
  const path = new Array<number>(T).fill(0);
  for (let code = 0; code < n ** T; code++) {
    let c = code;
    for (let t = T - 1; t >= 0; t--) {
      path[t] = c % n;
      c = Math.floor(c / n);
    }
    let p = model.start[path[0]];
    for (let t = 0; t < T; t++) {
      if (t > 0) p *= A[t][path[t - 1]][path[t]];
      if (obs[t] >= 0) p *= model.emission[path[t] * m + obs[t]];
    }
    total += p;
    for (let t = 0; t < T; t++) {
      gamma[t][path[t]] += p;
      if (t > 0) xi[t][path[t - 1]][path[t]] += p;
    }
    if (p > best) {
      second = best;
      best = p;
      bestPath = path.slice();
    } else if (p > second) second = p;
  }
  for (let t = 0; t < T; t++) {
    for (let i = 0; i < n; i++) {
      gamma[t][i] /= total;
      for (let j = 0; j < n; j++) xi[t][i][j] /= total;
    }
  }
  return { total, best, second, bestPath, gamma, xi };
}

export function pathProbability(model: HmmModel, obs: number[], dBin: number[], hBin: number[], path: number[]): number {
  const m = model.surfaces.length;
  let p = model.start[path[0]];
  for (let t = 0; t < obs.length; t++) {
    if (t > 0) p *= denseMoveTransition(model, dBin[t], hBin[t])[path[t - 1]][path[t]];
    if (obs[t] >= 0) p *= model.emission[path[t] * m + obs[t]];
  }
  return p;
}

/** An invented random model with cells scattered over two levels and random movement parameters. */
export function randomMoveModel(seed: number, nCells: number, nReadings: number): HmmModel {
  const model = randomModel(seed, { nCells, nReadings, startShare: 0.7 });
  const rng = new SeededRandom(seed ^ 0x5bd1e995);
  const cells = model.cells.map((c) => ({ ...c, x: Math.round(rng.next() * 6), y: Math.round(rng.next() * 6), level: rng.next() < 0.2 ? 1 : 0 }));
  return { ...model, cells, movement: { stayLogit: rng.next() * 6 - 2, stayPerMetre: rng.next() * 8, kappa: rng.next() * 4 } };
}

/** Random odometry bins: entry 0 unused, about a quarter of each unknown (−1). */
export function randomMoveSteps(rng: SeededRandom, T: number): { dBin: number[]; hBin: number[] } {
  const dBin = Array.from({ length: T }, (_, t) => (t === 0 || rng.next() < 0.25 ? -1 : rng.int(150)));
  const hBin = Array.from({ length: T }, (_, t) => (t === 0 || rng.next() < 0.25 ? -1 : rng.int(72)));
  return { dBin, hBin };
}
