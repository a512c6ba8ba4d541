import type { RunsTable } from '../io/runs-table.js';
import type { RunRow } from './report-data.js';
import { annotatedColumn } from './annotated-column.js';
import { numericValue } from './numeric-value.js';

/**
 * Per-run figures rebuilt from an annotated table when no run summary is given: steps and dropouts from
 * the runs, log-likelihood from the surprise column (log P(readings) = −ln 2 · Σ surprise_bits, because
 * surprise is −log2 P(reading | readings before it)), low-confidence and surprising steps from `flag`,
 * mean path posterior from `path_p`. A run with a reading but no surprise value (impossible under the
 * model) gets NaN. `splitOf` names each run's split.
 */
export function runRowsFromAnnotated(table: RunsTable, splitOf: (run: string) => string): RunRow[] {
  const surprise = annotatedColumn(table, 'surprise_bits');
  const flag = annotatedColumn(table, 'flag');
  const pathP = annotatedColumn(table, 'path_p');
  return table.runs.map((run): RunRow => {
    let dropouts = 0;
    let bits = 0;
    let missing = false;
    let low = 0;
    let surprising = 0;
    let sumP = 0;
    let nP = 0;
    for (let t = 0; t < run.obs.length; t++) {
      if (run.obs[t] < 0) dropouts++;
      const row = run.rows[t];
      if (row < 0) continue;
      const s = numericValue(surprise.get(row));
      if (run.obs[t] >= 0) {
        if (Number.isNaN(s)) missing = true;
        else bits += s;
      }
      const f = String(flag.get(row) ?? '').split('+');
      if (f.includes('low-confidence')) low++;
      if (f.includes('surprising')) surprising++;
      const p = numericValue(pathP.get(row));
      if (!Number.isNaN(p)) {
        sumP += p;
        nP++;
      }
    }
    const nReadings = run.obs.length - dropouts;
    return {
      run: run.id,
      split: splitOf(run.id),
      steps: run.obs.length,
      dropouts,
      loglikPerReading: missing || nReadings === 0 ? NaN : (-Math.LN2 * bits) / nReadings,
      meanPathP: nP > 0 ? sumP / nP : NaN,
      lowConfidenceSteps: low,
      surprisingSteps: surprising,
    };
  });
}
