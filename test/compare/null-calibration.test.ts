import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { fSurvival } from '../../src/compare/f-survival.js';
import { compareCells } from '../../src/compare/compare-cells.js';
import { drawNullRuns } from '../../src/compare/draw-null-runs.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { tinyModel } from '../helpers/tiny-model.js';
import { expectClose } from '../helpers/close.js';
import { fcSeed } from '../helpers/fc-seed.js';

describe('fSurvival(f, d1, d2) against a published F table', () => {
  // Source: NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.7.3, "Upper Critical Values
  // of the F Distribution" (3 decimals; recalled from memory — the same values are in every
  // statistics textbook's F table).
  const table: Array<[alpha: number, d1: number, d2: number, critical: number]> = [
    [0.05, 1, 10, 4.965],
    [0.05, 2, 10, 4.103],
    [0.05, 5, 10, 3.326],
    [0.05, 10, 10, 2.978],
    [0.01, 5, 10, 5.636],
    [0.05, 3, 20, 3.098],
    [0.05, 4, 40, 2.606],
    [0.01, 1, 20, 8.096],
  ];
  for (const [alpha, d1, d2, critical] of table) {
    it(`P(F(${d1}, ${d2}) ≥ ${critical}) = ${alpha}`, () => {
      // 3-decimal critical values: allow the p-value change that rounding causes.
      expectClose(fSurvival(critical, d1, d2), alpha, { rel: 2e-3 });
    });
  }
  it('matches the closed form for d1 = 2 far into the tail, and is 1 at 0', () => {
    // Closed form: P(F(2, d2) ≥ f) = (1 + 2f/d2)^(−d2/2) (the F(2, d2) survival function).
    for (const [f, d2] of [[3, 7], [40, 30], [500, 60]] as const) expectClose(fSurvival(f, 2, d2), (1 + (2 * f) / d2) ** (-d2 / 2), { rel: 1e-10 });
    expect(fSurvival(0, 3, 30)).toBe(1);
    expect(fSurvival(Infinity, 3, 30)).toBe(0);
  });
});

describe('drawNullRuns', () => {
  const model = tinyModel(
    [0.5, 0.5],
    [[0.7, 0.3], [0.4, 0.6]],
    [[0.9, 0.1], [0.2, 0.8]],
    ['oak', 'carpet'],
  );
  const like = [
    { id: 'a', obs: Int32Array.from([0, -1, 1, 1, -1]) },
    { id: 'b', obs: Int32Array.from([1, 0, 0]) },
  ];
  it('keeps ids, lengths and every dropout, draws valid readings elsewhere, and repeats for a seed', () => {
    const drawn = drawNullRuns(model, like, 7);
    expect(drawn.map((r) => r.id)).toEqual(['a', 'b']);
    drawn.forEach((r, k) => {
      expect(r.obs.length).toBe(like[k].obs.length);
      r.obs.forEach((v, t) => (like[k].obs[t] < 0 ? expect(v).toBe(-1) : expect([0, 1]).toContain(v)));
    });
    expect(drawNullRuns(model, like, 7)).toEqual(drawn);
  });
  it('draws readings at the model’s rates', () => {
    // One long run: the share of "oak" readings approaches the stationary mix (4/7 in cell 0) · 0.9 + (3/7) · 0.2.
    const long = [{ id: 'x', obs: new Int32Array(200_000) }];
    const obs = drawNullRuns(model, long, 3)[0].obs;
    const oak = obs.reduce((s, v) => s + (v === 0 ? 1 : 0), 0) / obs.length;
    expectClose(oak, (4 / 7) * 0.9 + (3 / 7) * 0.2, { abs: 0.01 });
  });
});

/**
 * Property: when each cell's statistic is a scaled chi-square with its own unknown scale (as expected
 * counts are: fewer effective readings than expected readings), the null draws calibrate it, and
 * Benjamini–Hochberg then keeps the false-discovery proportion near the nominal rate while large
 * changes are found. Expected counts are imitated by multinomial counts of N/k readings multiplied
 * by k (k = the cell's loss of information, 1 to 8).
 */
describe('compareCells with null draws: false discoveries stay near the nominal rate', () => {
  const n = 40;
  const m = 4;
  const surfaces = ['oak', 'carpet', 'tile', 'rubber'];
  const model = (emission: Float64Array): HmmModel => ({
    ...tinyModel(new Array(n).fill(1 / n), Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))), Array.from({ length: n }, () => [0.25, 0.25, 0.25, 0.25]), surfaces),
    emission,
  });
  function counts(rng: SeededRandom, rows: Float64Array, readings: number[], loss: number[]): Float64Array {
    const t = new Float64Array(n * m);
    for (let i = 0; i < n; i++) {
      const draws = Math.round(readings[i] / loss[i]);
      for (let d = 0; d < draws; d++) t[rng.pick(rows, i * m, m) * n + i] += loss[i];
    }
    return t;
  }
  function trial(seed: number, withOldCounts: boolean, nChanged: number) {
    const rng = new SeededRandom(seed);
    const truth = new Float64Array(n * m);
    const top: number[] = [];
    for (let i = 0; i < n; i++) {
      top.push(rng.int(m));
      for (let r = 0; r < m; r++) truth[i * m + r] = r === top[i] ? 0.82 : 0.06;
    }
    const loss = Array.from({ length: n }, () => 1 + 7 * rng.next());
    const readings = Array.from({ length: n }, () => 300 + rng.int(700));
    // The old row: exact, or estimated from the old runs (then its own error must be allowed for).
    const oldCounts = withOldCounts ? counts(rng, truth, readings, loss) : null;
    const oldRows = new Float64Array(truth);
    if (oldCounts) {
      for (let i = 0; i < n; i++) {
        let total = 0;
        for (let r = 0; r < m; r++) total += oldCounts[r * n + i];
        for (let r = 0; r < m; r++) oldRows[i * m + r] = (oldCounts[r * n + i] + 0.5) / (total + 0.5 * m);
      }
    }
    const after = new Float64Array(truth);
    const changed = new Set<number>();
    while (changed.size < nChanged) changed.add(rng.int(n));
    for (const i of changed) for (let r = 0; r < m; r++) after[i * m + r] = r === (top[i] + 1) % m ? 0.82 : 0.06;
    const observed = counts(rng, after, readings, loss);
    const nullDraws = Array.from({ length: 10 }, () => counts(rng, oldRows, readings, loss));
    const res = compareCells(model(oldRows), oldCounts, observed, { fdr: 0.05, minReadings: 100 }, nullDraws);
    const byId = new Map(res.changes.map((c) => [c.cell, c] as const));
    let discoveries = 0;
    let falseDiscoveries = 0;
    let found = 0;
    for (let i = 0; i < n; i++) {
      const c = byId.get(`c${i}`)!;
      if (c.verdict === 'changed') {
        discoveries++;
        if (!changed.has(i)) falseDiscoveries++;
        else found++;
      }
    }
    return { fdp: falseDiscoveries / Math.max(1, discoveries), found, anyFalse: falseDiscoveries > 0 };
  }
  // Measured over 1,000 trials (one fresh seed): mean FDP 0.044 (both cases), every change found; with nothing
  // changed some cell flagged in 6.0 % (old rows exact) and 7.7 % (old rows estimated) of trials — the
  // scaled-chi-square approximation is a little liberal in the far tail. The bounds below are that plus
  // about two standard errors of 120 trials.
  const trials = 120;
  for (const withOldCounts of [false, true]) {
    const what = withOldCounts ? 'old rows estimated from the old fit’s expected readings' : 'old rows known exactly';
    itSlow(`${what}: mean FDP ≤ 0.08 at a nominal 0.05 with 6 of 40 cells changed, and every change found`, () => {
      let fdp = 0;
      let found = 0;
      for (let t = 0; t < trials; t++) {
        const r = trial(fcSeed + 1000 * t + (withOldCounts ? 1 : 0), withOldCounts, 6);
        fdp += r.fdp;
        found += r.found;
      }
      // BH at q keeps E[FDP] ≤ q · n0/n = 0.05 · 34/40 for independent exact p-values; 0.08 leaves room for
      // the scaled-chi-square approximation and for the 120 trials' sampling error (sd ≈ 0.01).
      expect(fdp / trials).toBeLessThanOrEqual(0.08);
      // A change of the cell's surface with ≥ 300 expected readings is found nearly always.
      expect(found / (6 * trials)).toBeGreaterThanOrEqual(0.95);
    });
    itSlow(`${what}: with nothing changed, some cell is flagged in ≤ 13 % of trials (nominal 5 %)`, () => {
      let any = 0;
      for (let t = 0; t < trials; t++) if (trial(fcSeed + 1000 * t + 7, withOldCounts, 0).anyFalse) any++;
      expect(any / trials).toBeLessThanOrEqual(0.13);
    });
  }
});
