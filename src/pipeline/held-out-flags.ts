import { InputError, quote } from '../errors.js';
import type { LoadedRuns } from './load-runs.js';

/**
 * Per run, whether column `col` marks it `held-out` (any other value, or empty, means fitted). The value
 * must be the same on every row of a run; the column must exist in every runs table.
 */
export function heldOutFlags(loaded: LoadedRuns, col: string): boolean[] {
  return loaded.runs.map((r) => {
    const table = loaded.tables[r.table];
    const column = table.columns.find((c) => c.name === col);
    if (!column) {
      throw new InputError(`${table.source}: column ${quote(col)} named by --holdout-col must exist, got columns ${table.columns.map((c) => c.name).join(', ')}`);
    }
    const rows = table.runs[r.run].rows;
    let value: string | null | undefined;
    for (let t = 0; t < rows.length; t++) {
      if (rows[t] < 0) continue;
      const v = column.get(rows[t]);
      const text = v === null ? '' : String(v).trim();
      if (value === undefined) value = text;
      else if (value !== text) {
        throw new InputError(`${table.source}: column ${quote(col)} must hold one value per run, got ${quote(value)} and ${quote(text)} in run ${quote(r.id)}`);
      }
    }
    return value === 'held-out';
  });
}
