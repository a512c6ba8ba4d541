import { InputError, quote } from '../errors.js';
import type { NamedColumns } from '../io/columns-from-bytes.js';
import type { RunRow } from './report-data.js';
import { requiredColumn } from './required-column.js';
import { numericValue } from './numeric-value.js';

const WHAT = 'run summary table';

/**
 * Rows of a run summary table (as `decode --summary` writes it): `run`, `steps`, `loglik_per_reading`,
 * `low_confidence_steps`, `surprising_steps` are required; `split`, `dropouts`, `mean_path_p` are used
 * when present. Counts must be whole numbers ≥ 0; an empty log-likelihood (an impossible run) is NaN.
 */
export function runRowsFromTable(table: NamedColumns): RunRow[] {
  const run = requiredColumn(table, 'run', WHAT);
  const steps = requiredColumn(table, 'steps', WHAT);
  const ll = requiredColumn(table, 'loglik_per_reading', WHAT);
  const low = requiredColumn(table, 'low_confidence_steps', WHAT);
  const surprising = requiredColumn(table, 'surprising_steps', WHAT);
  const split = table.column('split');
  const dropouts = table.column('dropouts');
  const meanP = table.column('mean_path_p');
  const count = (get: (row: number) => unknown, name: string, row: number): number => {
    const v = numericValue(get(row) as string | number | null);
    if (!Number.isInteger(v) || v < 0) throw new InputError(`${table.source}: ${table.locate(row)} ${name} must be a whole number ≥ 0, got ${quote(get(row))}`);
    return v;
  };
  const rows: RunRow[] = [];
  for (let r = 0; r < table.nRows; r++) {
    const id = run(r);
    if (id === null || id === '') throw new InputError(`${table.source}: ${table.locate(r)} run must be a run id, got an empty value`);
    const llValue = numericValue(ll(r));
    if (ll(r) !== null && ll(r) !== '' && Number.isNaN(llValue)) throw new InputError(`${table.source}: ${table.locate(r)} loglik_per_reading must be a number, got ${quote(ll(r))}`);
    rows.push({
      run: String(id),
      split: split ? String(split(r) ?? '') : '',
      steps: count(steps, 'steps', r),
      dropouts: dropouts ? count(dropouts, 'dropouts', r) : 0,
      loglikPerReading: llValue,
      meanPathP: meanP ? numericValue(meanP(r)) : NaN,
      lowConfidenceSteps: count(low, 'low_confidence_steps', r),
      surprisingSteps: count(surprising, 'surprising_steps', r),
    });
  }
  return rows;
}
