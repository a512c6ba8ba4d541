import { InputError, quote } from '../errors.js';
import type { HmmModel } from '../model/hmm-model.js';
import type { RunsTable } from '../io/runs-table.js';
import { annotatedColumn } from './annotated-column.js';
import { numericValue } from './numeric-value.js';

export interface CellConfidence {
  /** Mean `path_p` over the rows whose `path_cell` is the cell; NaN for cells never on a path. */
  meanPathP: Float64Array;
  /** Rows decoded onto each cell. */
  steps: Float64Array;
}

/**
 * Mean decoding confidence per cell from an annotated table: the mean posterior probability of the path
 * cell (`path_p`) over the rows whose Viterbi cell (`path_cell`) is that cell. Rows without a path cell
 * (runs impossible under the model) are skipped; a path cell that is not a cell of the model is an error
 * (the table was decoded with another model).
 */
export function meanConfidenceByCell(model: HmmModel, table: RunsTable): CellConfidence {
  const cellCol = annotatedColumn(table, 'path_cell');
  const pCol = annotatedColumn(table, 'path_p');
  const index = new Map(model.cells.map((c, i) => [c.id, i] as const));
  const n = model.cells.length;
  const sum = new Float64Array(n);
  const steps = new Float64Array(n);
  for (let row = 0; row < table.nRows; row++) {
    const id = cellCol.get(row);
    if (id === null || id === '') continue;
    const i = index.get(String(id));
    if (i === undefined) {
      throw new InputError(`${table.source}: row ${row + 1} path_cell must name a cell of the model, got ${quote(String(id))} (was the table decoded with another model?)`);
    }
    const p = numericValue(pCol.get(row));
    if (Number.isNaN(p)) continue;
    sum[i] += p;
    steps[i]++;
  }
  const meanPathP = new Float64Array(n);
  for (let i = 0; i < n; i++) meanPathP[i] = steps[i] > 0 ? sum[i] / steps[i] : NaN;
  return { meanPathP, steps };
}
