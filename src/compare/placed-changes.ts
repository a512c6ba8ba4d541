import type { CellComparison } from './compare-cells.js';

/**
 * What `compare --write-floor` writes: cell id → new surface (its most likely reading in the new runs),
 * for the reported changes the runs place on one cell, and only where that surface differs from the
 * cell's surveyed one (`surfaceOf`). A reported region of several cells could carry its change at any
 * of them, so none of its cells is written.
 */
export function placedChanges(comparison: Pick<CellComparison, 'changes' | 'regions'>, surfaceOf: (cell: string) => string | undefined): Map<string, string> {
  const placed = new Set(comparison.regions.filter((r) => r.verdict === 'changed' && r.cells.length === 1).map((r) => r.cells[0]));
  const out = new Map<string, string>();
  for (const c of comparison.changes) if (placed.has(c.cell) && c.surfaceAfter !== surfaceOf(c.cell)) out.set(c.cell, c.surfaceAfter);
  return out;
}
