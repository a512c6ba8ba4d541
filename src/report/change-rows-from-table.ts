import { InputError, quote } from '../errors.js';
import type { NamedColumns } from '../io/columns-from-bytes.js';
import type { ChangeRow, Verdict } from './report-data.js';
import { requiredColumn } from './required-column.js';
import { numericValue } from './numeric-value.js';

const WHAT = 'changes table';
const VERDICTS: readonly Verdict[] = ['changed', 'unchanged', 'too-few-readings'];

/**
 * Rows of a changes table (as `compare` writes it): `cell` and `verdict` are required, and every cell
 * must be a cell of the model; `surface_before`, `surface_after`, `expected_readings`, `tv_distance`,
 * `q_value`, `region`, `candidates` and `explanation` are shown when present (tables written before
 * regions have no `region`: each changed cell is then shown on its own). A cell listed twice is an error.
 */
export function changeRowsFromTable(table: NamedColumns, cellIds: readonly string[]): ChangeRow[] {
  const cell = requiredColumn(table, 'cell', WHAT);
  const verdict = requiredColumn(table, 'verdict', WHAT);
  const before = table.column('surface_before');
  const after = table.column('surface_after');
  const expected = table.column('expected_readings');
  const tv = table.column('tv_distance');
  const q = table.column('q_value');
  const region = table.column('region');
  const candidates = table.column('candidates');
  const explanation = table.column('explanation');
  const known = new Set(cellIds);
  const seen = new Set<string>();
  const rows: ChangeRow[] = [];
  const text = (get: ((row: number) => unknown) | null, row: number): string | null => {
    const v = get ? get(row) : null;
    return v === null || v === undefined || v === '' ? null : String(v);
  };
  for (let r = 0; r < table.nRows; r++) {
    const id = text(cell, r);
    if (id === null || !known.has(id)) throw new InputError(`${table.source}: ${table.locate(r)} cell must be a cell of the model, got ${quote(cell(r))}`);
    if (seen.has(id)) throw new InputError(`${table.source}: ${table.locate(r)} cell must appear once, got ${quote(id)} again`);
    seen.add(id);
    const v = text(verdict, r);
    if (!VERDICTS.includes(v as Verdict)) throw new InputError(`${table.source}: ${table.locate(r)} verdict must be one of ${VERDICTS.join(', ')}, got ${quote(verdict(r))}`);
    rows.push({
      cell: id,
      verdict: v as Verdict,
      surfaceBefore: text(before, r),
      surfaceAfter: text(after, r),
      expectedReadings: expected ? numericValue(expected(r)) : NaN,
      tvDistance: tv ? numericValue(tv(r)) : NaN,
      qValue: q ? numericValue(q(r)) : NaN,
      region: text(region, r),
      candidates: (text(candidates, r) ?? '').split(';').filter((c) => c !== ''),
      explanation: text(explanation, r),
    });
  }
  return rows;
}
