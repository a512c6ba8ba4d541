import type { HmmModel } from '../model/hmm-model.js';
import { gStatistic } from './g-statistic.js';
import { gHomogeneity } from './g-homogeneity.js';
import { chiSquareSurvival } from './chi-square-survival.js';
import { benjaminiHochberg } from './benjamini-hochberg.js';
import { chiSquareMedian } from './chi-square-median.js';
import { fSurvival } from './f-survival.js';
import { explainChange } from './explain-change.js';
import { buildRegions, DEFAULT_REGION_OPTIONS, type RegionOptions } from './build-regions.js';

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
  /** The region's q-value (Benjamini–Hochberg over regions); null when the region had too few readings. */
  qValue: number | null;
  /** The region's verdict (every cell of a reported region is `changed`: it could carry the change). */
  verdict: CellVerdict;
  /** Id of the cell's region (`R1`, `R2`, … by q-value): cells the runs cannot tell apart share one. */
  region: string;
  /** The cells of the region (the cells that could carry its change), strongest evidence first. */
  candidates: string[];
  /** One plain sentence: what the cell reads now and before, and why it is (not) flagged (`explain-change.ts`). */
  explanation: string;
}

/** One region: a set of cells the runs cannot tell apart, tested as one unit. */
export interface RegionChange {
  region: string;
  cells: string[];
  /** Expected readings of the region's cells in the new runs. */
  expectedReadings: number;
  /** G of the pooled counts; null when too few readings. */
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
  /** How regions are formed (`build-regions.ts`); false: every cell is its own region. @default DEFAULT_REGION_OPTIONS */
  regions?: RegionOptions | false;
}

/** The cells' verdicts and the calibration factor used. */
export interface CellComparison {
  changes: CellChange[];
  /** The regions, by q-value (untested last). */
  regions: RegionChange[];
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
 * Regions (`build-regions.ts`): cells the runs cannot tell apart (look-alike old rows, near each
 * other, within one zone) are reported as one change. A region is tested as one unit: its cells'
 * counts pooled into one G test against the same null draws, combined (Bonferroni) with its strongest
 * cell's test. Benjamini–Hochberg across the tested regions; every cell carries its region's q-value
 * and verdict, its own p-value. Sorted by region (by q-value), within a region by the cell's p-value;
 * regions with too few readings last, by expected readings, descending.
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
  const counts = new Float64Array(m);
  const before = new Float64Array(m);
  const drawn = new Float64Array(m);
  const pool = (t: Float64Array, cells: readonly number[], out: Float64Array): number => {
    let total = 0;
    for (let r = 0; r < m; r++) {
      let v = 0;
      for (const i of cells) v += t[r * n + i];
      total += out[r] = v;
    }
    return total;
  };
  // The old rows of a set of cells mixed as the new runs visit them (each cell weighted by its expected
  // readings in the new runs): what the pooled counts would follow under no change.
  const oldRowOf = (cells: readonly number[], out: Float64Array): void => {
    out.fill(0);
    let sum = 0;
    for (const i of cells) {
      let w = 0;
      for (let r = 0; r < m; r++) w += newCountsT[r * n + i];
      sum += w;
      for (let r = 0; r < m; r++) out[r] += w * oldModel.emission[i * m + r];
    }
    for (let r = 0; r < m; r++) out[r] = sum > 0 ? out[r] / sum : 1 / m;
  };
  const oldRow = new Float64Array(m);
  /** G of a unit (one cell or a region's cells pooled), and with null draws its null scale; null when too few readings. */
  const testUnit = (cells: readonly number[]): { total: number; g: number | null; dfUnit: number; scale: number } => {
    const total = pool(newCountsT, cells, counts);
    if (total < options.minReadings) return { total, g: null, dfUnit: df, scale: NaN };
    oldRowOf(cells, oldRow);
    if (draws > 0) {
      // With the old fit's counts: G of homogeneity (old vs new counts; the pooled row keeps small
      // old probabilities from blowing G up); without: G goodness of fit against the old row.
      let oldTotal = Infinity;
      if (oldCountsT) oldTotal = (options.oldPriorStrength ?? 0) * cells.length + pool(oldCountsT, cells, before);
      const statistic = (c: Float64Array): number => (oldCountsT ? gHomogeneity(before, c).g : gStatistic(c, oldRow));
      const g = statistic(counts);
      let nullSum = 0;
      for (const t of nullCountsT) {
        pool(t, cells, drawn);
        nullSum += statistic(drawn);
      }
      // The draws vary only the new side; the old side's own error scales the null by 1 + N_new / N_old.
      return { total, g, dfUnit: df, scale: ((1 + (oldTotal > 0 ? total / oldTotal : Infinity)) * nullSum) / (draws * df) };
    }
    if (oldCountsT) {
      pool(oldCountsT, cells, before);
      const { g, df: dfH } = gHomogeneity(before, counts);
      return { total, g, dfUnit: dfH, scale: NaN };
    }
    return { total, g: gStatistic(counts, oldRow), dfUnit: df, scale: NaN };
  };
  const rows: CellChange[] = [];
  const tests: Array<ReturnType<typeof testUnit>> = [];
  for (let i = 0; i < n; i++) {
    const total = pool(newCountsT, [i], counts);
    const cellRow = oldModel.emission.subarray(i * m, (i + 1) * m);
    let tv = 0;
    for (let r = 0; r < m; r++) tv += Math.abs(cellRow[r] - (total > 0 ? counts[r] / total : cellRow[r])) / 2;
    const surfaceAfter = oldModel.surfaces[total > 0 ? argmax(counts) : argmax(cellRow)];
    const t = testUnit([i]);
    tests.push(t);
    rows.push({
      cell: oldModel.cells[i].id,
      surfaceBefore: oldModel.surfaces[argmax(cellRow)],
      surfaceAfter,
      expectedReadings: total,
      tvDistance: tv,
      gStat: t.g,
      pValue: null,
      qValue: null,
      verdict: 'too-few-readings',
      region: '',
      candidates: [],
      explanation: '',
    });
  }
  let inflation = 1;
  const tested = tests.map((t, i) => (t.g !== null ? i : -1)).filter((i) => i >= 0);
  if (draws > 0) {
    inflation = median(tested.map((i) => tests[i].scale).filter(Number.isFinite));
  } else {
    // Median calibration ("genomic control", Devlin & Roeder 1999, Biometrics 55(4)): rescales by how
    // far the median G exceeds the median of its chi-square reference; assumes most cells did not change.
    const ratios = tested.map((i) => tests[i].g! / chiSquareMedian(tests[i].dfUnit)).filter(Number.isFinite);
    inflation = options.calibrate !== false && ratios.length >= 5 ? Math.max(1, median(ratios)) : 1;
  }
  const pOf = (t: ReturnType<typeof testUnit>): number | null => {
    if (t.g === null) return null;
    if (draws === 0) return chiSquareSurvival(t.g / inflation, t.dfUnit);
    // F = (G / df) / (null scale); a zero null scale (no variation at all in the draws) leaves only G > 0 or not.
    const scale = t.scale;
    return scale > 0 && Number.isFinite(scale) ? fSurvival(t.g / (df * scale), df, draws * df) : scale === Infinity ? 1 : t.g > 0 ? 0 : 1;
  };
  const cellP = tests.map(pOf);
  cellP.forEach((p, i) => (rows[i].pValue = p));
  // Regions: cells the runs cannot tell apart, formed around the strongest evidence first.
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => (cellP[a] ?? 2) - (cellP[b] ?? 2) || (rows[b].gStat ?? 0) - (rows[a].gStat ?? 0) || a - b);
  const built = options.regions === false ? { regions: order.map((i) => [i]) } : buildRegions(oldModel, order, options.regions ?? DEFAULT_REGION_OPTIONS);
  // A region's p-value: its pooled G test (a whole room re-floored), or its strongest cell (one worn
  // cell in a large look-alike room, diluted in the pool) — Bonferroni over the region's tested cells
  // and over the two tests, so it stays valid under no change.
  const regionTests = built.regions.map((cells) => {
    const t = cells.length === 1 ? tests[cells[0]] : testUnit(cells);
    const pPool = pOf(t);
    const cellPs = cells.map((i) => cellP[i]).filter((p): p is number => p !== null);
    let p = pPool;
    if (cells.length > 1 && cellPs.length > 0) {
      const best = Math.min(1, cellPs.length * Math.min(...cellPs));
      p = Math.min(1, 2 * Math.min(pPool ?? 1, best));
    }
    return { cells, total: t.total, g: t.g, p };
  });
  const testedRegions = regionTests.map((r, k) => (r.p !== null ? k : -1)).filter((k) => k >= 0);
  const q = benjaminiHochberg(testedRegions.map((k) => regionTests[k].p!));
  const regionQ = new Array<number | null>(regionTests.length).fill(null);
  testedRegions.forEach((k, t) => (regionQ[k] = q[t]));
  // Region ids by q-value, then by size of evidence; untested regions last, by expected readings.
  const regionOrder = regionTests.map((_, k) => k).sort((a, b) => {
    const qa = regionQ[a];
    const qb = regionQ[b];
    if (qa === null || qb === null) {
      if (qa !== null) return -1;
      if (qb !== null) return 1;
      return regionTests[b].total - regionTests[a].total || a - b;
    }
    return qa - qb || (regionTests[a].p ?? 1) - (regionTests[b].p ?? 1) || a - b;
  });
  const regions: RegionChange[] = [];
  regionOrder.forEach((k, rank) => {
    const r = regionTests[k];
    const id = `R${rank + 1}`;
    const verdict: CellVerdict = regionQ[k] === null ? 'too-few-readings' : regionQ[k]! <= options.fdr ? 'changed' : 'unchanged';
    // Candidates, strongest first: by the cell's own p-value, untested cells last by expected readings.
    const strongest = [...r.cells].sort((a, b) => (cellP[a] ?? 2) - (cellP[b] ?? 2) || rows[b].expectedReadings - rows[a].expectedReadings || a - b);
    const candidates = strongest.map((i) => rows[i].cell);
    for (const i of r.cells) {
      Object.assign(rows[i], { region: id, candidates, qValue: regionQ[k], verdict });
      pool(newCountsT, [i], counts);
      rows[i].explanation = explainChange({
        surfaces: oldModel.surfaces,
        oldRow: oldModel.emission.subarray(i * m, (i + 1) * m),
        newCounts: counts,
        verdict,
        pValue: cellP[i],
        region: id,
        regionSize: r.cells.length,
        fdr: options.fdr,
        minReadings: options.minReadings,
      });
    }
    regions.push({ region: id, cells: candidates, expectedReadings: r.total, gStat: r.g, pValue: r.p, qValue: regionQ[k], verdict });
  });
  const regionIndex = new Map(regions.map((r, k) => [r.region, k]));
  const sorted = rows
    .map((row, i) => ({ row, i }))
    .sort((a, b) => regionIndex.get(a.row.region)! - regionIndex.get(b.row.region)! || (cellP[a.i] ?? 2) - (cellP[b.i] ?? 2) || (b.row.gStat ?? 0) - (a.row.gStat ?? 0) || b.row.expectedReadings - a.row.expectedReadings || a.i - b.i)
    .map((x) => x.row);
  return { changes: sorted, regions, inflation, nullDraws: draws };
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
