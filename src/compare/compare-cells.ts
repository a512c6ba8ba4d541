import type { HmmModel } from '../model/hmm-model.js';
import { gStatistic } from './g-statistic.js';
import { gHomogeneity } from './g-homogeneity.js';
import { chiSquareSurvival } from './chi-square-survival.js';
import { benjaminiHochberg } from './benjamini-hochberg.js';
import { chiSquareMedian } from './chi-square-median.js';

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
}

/** The cells' verdicts and the calibration factor used. */
export interface CellComparison {
  changes: CellChange[];
  /** λ, the factor the G statistics were divided by (1 = none). */
  inflation: number;
}

/**
 * Per cell, whether its reading distribution changed, from expected reading counts (readings × cells,
 * `r * nCells + i`) of the new runs. With the old fit's own expected counts (`oldCountsT`, recorded in
 * model files as `fit.cellReadings`), a G test of homogeneity between the old and new counts, so the
 * old row's own sampling error is accounted for; without them, a G goodness-of-fit test of the new
 * counts against the old row. Chi-square p-values, then Benjamini–Hochberg across the tested cells.
 * Sorted by q-value; cells with too few readings last, by expected readings, descending.
 */
export function compareCells(
  oldModel: HmmModel,
  oldCountsT: Float64Array | null,
  newCountsT: Float64Array,
  options: CompareOptions,
): CellComparison {
  const n = oldModel.cells.length;
  const m = oldModel.surfaces.length;
  const rows: CellChange[] = [];
  const tested: number[] = [];
  const dfs: number[] = [];
  const counts = new Float64Array(m);
  const before = new Float64Array(m);
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
      if (oldCountsT) {
        for (let r = 0; r < m; r++) before[r] = oldCountsT[r * n + i];
        const { g, df } = gHomogeneity(before, counts);
        row.gStat = g;
        dfs.push(df);
      } else {
        row.gStat = gStatistic(counts, oldRow);
        dfs.push(Math.max(1, m - 1));
      }
      tested.push(rows.length);
    }
    rows.push(row);
  }
  // Expected counts carry less information than plain counts of the same size (readings are attributed
  // to cells with uncertainty), so G runs large even where nothing changed. Median calibration ("genomic
  // control", Devlin & Roeder 1999, Biometrics 55(4)) rescales by how far the median G exceeds the median
  // of its chi-square reference; it assumes most cells did not change, as after a refurbishment.
  const ratios = tested.map((k, t) => rows[k].gStat! / chiSquareMedian(dfs[t])).filter(Number.isFinite).sort((a, b) => a - b);
  const inflation =
    options.calibrate !== false && ratios.length >= 5 ? Math.max(1, ratios.length % 2 ? ratios[(ratios.length - 1) / 2] : (ratios[ratios.length / 2 - 1] + ratios[ratios.length / 2]) / 2) : 1;
  const pValues = tested.map((k, t) => {
    const p = chiSquareSurvival(rows[k].gStat! / inflation, dfs[t]);
    rows[k].pValue = p;
    return p;
  });
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
  return { changes: rows, inflation };
}

function argmax(row: ArrayLike<number>): number {
  let best = 0;
  for (let r = 1; r < row.length; r++) if (row[r] > row[best]) best = r;
  return best;
}
