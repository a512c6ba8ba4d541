import type { HmmModel } from '../model/hmm-model.js';
import { gStatistic } from './g-statistic.js';
import { gHomogeneity } from './g-homogeneity.js';
import { chiSquareSurvival } from './chi-square-survival.js';
import { benjaminiHochberg } from './benjamini-hochberg.js';
import { chiSquareMedian } from './chi-square-median.js';
import { fSurvival } from './f-survival.js';

export type CellVerdict = 'changed' | 'unchanged' | 'too-few-readings';

/** One row of the changes table. */
export interface CellChange {
  cell: string;
  /** Most likely reading of the old emission row. */
  surfaceBefore: string;
  /** Most likely reading among the cell's expected readings in the new runs. */
  surfaceAfter: string;
  /** Expected readings of the cell in the new runs. */
  expectedReadings: number;
  /** Total variation distance between the old row and the new runs' reading frequencies of the cell. */
  tvDistance: number;
  /** G statistic; null when too few readings. Infinity when the old row forbade a reading now seen. */
  gStat: number | null;
  pValue: number | null;
  qValue: number | null;
  verdict: CellVerdict;
}

export interface CompareOptions {
  /** False-discovery rate for Benjamini–Hochberg. @default 0.05 */
  fdr: number;
  /** Cells with fewer expected readings in the new runs are `too-few-readings`, never `unchanged`. @default 100 */
  minReadings: number;
  /**
   * Median calibration of the G statistics (on unless false): divide every G by
   * λ = max(1, median_i G_i / median χ²(df_i)) before taking p-values. @default true
   */
  calibrate?: boolean;
  /**
   * Pseudo-readings per cell behind the old fit's prior: the old row rests on the old expected readings
   * plus these (used with null draws to weigh the old row's own sampling error). @default 0
   */
  oldPriorStrength?: number;
}

/** The cells' verdicts and the calibration factor used. */
export interface CellComparison {
  changes: CellChange[];
  /**
   * Without null draws: λ, the factor the G statistics were divided by (1 = none). With null draws: the
   * median over tested cells of the simulated null scale (mean null G per degree of freedom).
   */
  inflation: number;
  /** How many null draws calibrated the p-values (0: chi-square reference with median calibration). */
  nullDraws: number;
}

/**
 * Per cell, whether its reading distribution changed, from expected reading counts (readings × cells,
 * `r * nCells + i`) of the new runs.
 *
 * With null draws (`nullCountsT`: the same expected counts from copies of the new runs simulated under
 * the old model and re-fitted the same way — a parametric bootstrap, Efron & Tibshirani, "An
 * Introduction to the Bootstrap", 1993, ch. 6): per cell a G statistic — of homogeneity between the
 * old fit's counts and the new counts when the model file recorded them, else of goodness of fit of
 * the new counts against the old row — referred to its own simulated null distribution. Expected counts are not
 * multinomial counts (readings are attributed to cells with uncertainty, and look-alike cells trade
 * readings), so G runs larger than chi-square by a factor that differs from cell to cell; the draws
 * measure that factor. Treating G as a scaled chi-square (Satterthwaite's approximation), the ratio of
 * the observed G to the mean of B null Gs is F(df, B·df)-distributed under no change, which accounts
 * for the scale being estimated from B draws. The old row's own sampling error is added in proportion
 * to the readings behind it (same cell, same kind of runs, so the same loss of information): the null
 * scale is multiplied by 1 + N_new / (N_old + w).
 *
 * Without null draws (a quick screen, not calibrated): a G test of homogeneity against the old fit's
 * own expected counts (`oldCountsT`, recorded in model files as `fit.cellReadings`), or goodness of fit
 * against the old row, with chi-square p-values after median calibration.
 *
 * Benjamini–Hochberg across the tested cells. Sorted by q-value; cells with too few readings last, by
 * expected readings, descending.
 */
export function compareCells(
  oldModel: HmmModel,
  oldCountsT: Float64Array | null,
  newCountsT: Float64Array,
  options: CompareOptions,
  nullCountsT: readonly Float64Array[] = [],
): CellComparison {
  const n = oldModel.cells.length;
  const m = oldModel.surfaces.length;
  const draws = nullCountsT.length;
  const df = Math.max(1, m - 1);
  const rows: CellChange[] = [];
  const tested: number[] = [];
  const dfs: number[] = [];
  const scales: number[] = [];
  const counts = new Float64Array(m);
  const before = new Float64Array(m);
  const drawn = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    let total = 0;
    for (let r = 0; r < m; r++) total += counts[r] = newCountsT[r * n + i];
    const oldRow = oldModel.emission.subarray(i * m, (i + 1) * m);
    let tv = 0;
    for (let r = 0; r < m; r++) tv += Math.abs(oldRow[r] - (total > 0 ? counts[r] / total : oldRow[r])) / 2;
    const row: CellChange = {
      cell: oldModel.cells[i].id,
      surfaceBefore: oldModel.surfaces[argmax(oldRow)],
      surfaceAfter: oldModel.surfaces[total > 0 ? argmax(counts) : argmax(oldRow)],
      expectedReadings: total,
      tvDistance: tv,
      gStat: null,
      pValue: null,
      qValue: null,
      verdict: 'too-few-readings',
    };
    if (total >= options.minReadings) {
      if (draws > 0) {
        // With the old fit's counts: G of homogeneity (old vs new counts; the pooled row keeps small
        // old probabilities from blowing G up); without: G goodness of fit against the old row.
        let oldTotal = Infinity;
        if (oldCountsT) {
          oldTotal = options.oldPriorStrength ?? 0;
          for (let r = 0; r < m; r++) oldTotal += before[r] = oldCountsT[r * n + i];
        }
        const statistic = (c: Float64Array): number => (oldCountsT ? gHomogeneity(before, c).g : gStatistic(c, oldRow));
        row.gStat = statistic(counts);
        let nullSum = 0;
        for (const t of nullCountsT) {
          for (let r = 0; r < m; r++) drawn[r] = t[r * n + i];
          nullSum += statistic(drawn);
        }
        // The draws vary only the new side; the old side's own error scales the null by 1 + N_new / N_old.
        scales.push(((1 + (oldTotal > 0 ? total / oldTotal : Infinity)) * nullSum) / (draws * df));
        dfs.push(df);
      } else if (oldCountsT) {
        for (let r = 0; r < m; r++) before[r] = oldCountsT[r * n + i];
        const { g, df: dfH } = gHomogeneity(before, counts);
        row.gStat = g;
        dfs.push(dfH);
      } else {
        row.gStat = gStatistic(counts, oldRow);
        dfs.push(df);
      }
      tested.push(rows.length);
    }
    rows.push(row);
  }
  let inflation = 1;
  let pValues: number[];
  if (draws > 0) {
    pValues = tested.map((k, t) => {
      const g = rows[k].gStat!;
      const scale = scales[t];
      // F = (G / df) / (null scale); a zero null scale (no variation at all in the draws) leaves only G > 0 or not.
      return scale > 0 && Number.isFinite(scale) ? fSurvival(g / (df * scale), df, draws * df) : scale === Infinity ? 1 : g > 0 ? 0 : 1;
    });
    inflation = median(scales.filter(Number.isFinite));
  } else {
    // Median calibration ("genomic control", Devlin & Roeder 1999, Biometrics 55(4)): rescales by how
    // far the median G exceeds the median of its chi-square reference; assumes most cells did not change.
    const ratios = tested.map((k, t) => rows[k].gStat! / chiSquareMedian(dfs[t])).filter(Number.isFinite);
    inflation = options.calibrate !== false && ratios.length >= 5 ? Math.max(1, median(ratios)) : 1;
    pValues = tested.map((k, t) => chiSquareSurvival(rows[k].gStat! / inflation, dfs[t]));
  }
  tested.forEach((k, t) => (rows[k].pValue = pValues[t]));
  const q = benjaminiHochberg(pValues);
  tested.forEach((k, t) => {
    rows[k].qValue = q[t];
    rows[k].verdict = q[t] <= options.fdr ? 'changed' : 'unchanged';
  });
  rows.sort((a, b) => {
    if (a.qValue === null || b.qValue === null) {
      if (a.qValue !== null) return -1;
      if (b.qValue !== null) return 1;
      return b.expectedReadings - a.expectedReadings;
    }
    return a.qValue - b.qValue || (b.gStat ?? 0) - (a.gStat ?? 0);
  });
  return { changes: rows, inflation, nullDraws: draws };
}

function median(xs: number[]): number {
  if (xs.length === 0) return 1;
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

function argmax(row: ArrayLike<number>): number {
  let best = 0;
  for (let r = 1; r < row.length; r++) if (row[r] > row[best]) best = r;
  return best;
}
