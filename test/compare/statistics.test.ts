import { describe, it, expect } from 'vitest';
import { chiSquareSurvival } from '../../src/compare/chi-square-survival.js';
import { gStatistic } from '../../src/compare/g-statistic.js';
import { gHomogeneity } from '../../src/compare/g-homogeneity.js';
import { benjaminiHochberg } from '../../src/compare/benjamini-hochberg.js';
import { expectClose } from '../helpers/close.js';

describe('chiSquareSurvival(x, df) against a published chi-square table', () => {
  // Source: NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.7.4, "Critical Values of the
  // Chi-Square Distribution" (upper-tail critical values, 3 decimals; recalled from memory, and the same
  // values appear in every statistics textbook's chi-square table).
  const table: Array<[df: number, alpha: number, critical: number]> = [
    [1, 0.05, 3.841],
    [1, 0.01, 6.635],
    [2, 0.05, 5.991],
    [3, 0.1, 6.251],
    [5, 0.001, 20.515],
    [3, 0.05, 7.815],
    [4, 0.05, 9.488],
    [5, 0.05, 11.07],
    [5, 0.01, 15.086],
    [10, 0.05, 18.307],
  ];
  for (const [df, alpha, critical] of table) {
    it(`P(χ²(${df}) ≥ ${critical}) = ${alpha}`, () => {
      // The table's critical values carry 3 decimals: allow the p-value change that rounding causes.
      expectClose(chiSquareSurvival(critical, df), alpha, { rel: 2e-3 });
    });
  }
  it('keeps precision far in the tail and is 1 at 0', () => {
    expect(chiSquareSurvival(0, 3)).toBe(1);
    expect(chiSquareSurvival(Infinity, 3)).toBe(0);
    // χ²(2) survival is exactly exp(−x/2): a closed form to check the tail against.
    expectClose(chiSquareSurvival(200, 2), Math.exp(-100), { rel: 1e-12 });
  });
});

describe('gStatistic(counts, probs) on a hand-made count table', () => {
  it('G of 30, 14, 34, 45, 57, 20 against equal probabilities is 38.47 with p < 0.001 (df 5)', () => {
    // Hand calculation: N = 200, expected 33.33 each; G = 2 Σ n ln(n / 33.333…).
    const counts = [30, 14, 34, 45, 57, 20];
    const byHand = 2 * counts.reduce((s, n) => s + n * Math.log(n / (200 / 6)), 0);
    const g = gStatistic(counts, new Array(6).fill(1 / 6));
    expectClose(g, byHand, { rel: 1e-12 });
    // The same sum worked term by term by hand (7-digit logarithms): 2 × 19.235776 = 38.4716.
    expectClose(g, 38.4716, { abs: 5e-4 });
    // Published table (NIST, as above): χ²(5) critical value at α = 0.001 is 20.515; G is beyond it.
    expect(g).toBeGreaterThan(20.515);
    expect(chiSquareSurvival(g, 5)).toBeLessThan(0.001);
  });
  it('G between the 0.10 and 0.05 critical values of χ²(3) gives p between them', () => {
    // By hand: 2 × (62 ln 1.24 + 38 ln 0.76 + 55 ln 1.1 + 45 ln 0.9) = 2 × 3.40915 = 6.8183.
    // NIST table (as above): χ²(3) critical values 6.251 (α 0.10) and 7.815 (α 0.05).
    const counts = [62, 38, 55, 45];
    const g = gStatistic(counts, [0.25, 0.25, 0.25, 0.25]);
    expectClose(g, 6.8183, { abs: 5e-4 });
    expect(g).toBeGreaterThan(6.251);
    expect(g).toBeLessThan(7.815);
    const p = chiSquareSurvival(g, 3);
    expect(p).toBeLessThan(0.1);
    expect(p).toBeGreaterThan(0.05);
  });
  it('is Infinity when a reading seen has probability zero, and 0 for counts that match exactly', () => {
    expect(gStatistic([1, 2], [1, 0])).toBe(Infinity);
    expect(gStatistic([25, 75], [0.25, 0.75])).toBe(0);
  });
});

describe('gHomogeneity(a, b)', () => {
  it('equals the G test of independence on the 2 × M table, computed by hand', () => {
    const a = [40, 10, 50];
    const b = [20, 30, 50];
    const total = 200;
    const cols = a.map((x, r) => x + b[r]);
    let byHand = 0;
    for (const [row, t] of [[a, 100], [b, 100]] as const) row.forEach((o, r) => (byHand += o * Math.log(o / ((t * cols[r]) / total))));
    const { g, df } = gHomogeneity(a, b);
    expectClose(g, 2 * byHand, { rel: 1e-12 });
    expect(df).toBe(2);
  });
  it('is 0 for proportional samples', () => {
    expectClose(gHomogeneity([10, 20, 30], [20, 40, 60]).g, 0, { abs: 1e-12 });
  });
});

describe('benjaminiHochberg(p)', () => {
  it('matches the step-up rule on a hand-worked list', () => {
    // Hand-worked: m = 5, sorted p 0.01, 0.02, 0.03, 0.04, 0.2 → p·m/rank 0.05, 0.05, 0.05, 0.05, 0.2.
    expect(benjaminiHochberg([0.04, 0.01, 0.2, 0.03, 0.02]).map((q) => +q.toFixed(12))).toEqual([0.05, 0.05, 0.2, 0.05, 0.05]);
  });
  it('never gives q below p, keeps order, and caps at 1', () => {
    const p = [0.5, 0.9, 0.001, 0.7];
    const q = benjaminiHochberg(p);
    q.forEach((v, i) => expect(v).toBeGreaterThanOrEqual(p[i]));
    expect(Math.max(...q)).toBeLessThanOrEqual(1);
    expect(q[2]).toBeLessThan(q[0]);
  });
});
