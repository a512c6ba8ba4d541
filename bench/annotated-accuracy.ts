import type { FloorGraph } from '../src/model/floor-graph.js';
import { parseCsv } from '../src/io/parse-csv.js';

/** Shares of an annotated table's rows whose decoded cell or zone matches `true_cell` (simulated runs). */
export interface AnnotatedAccuracy {
  rows: number;
  pathExact: number;
  pathNear: number;
  likelyExact: number;
  likelyNear: number;
  /** Against the true cell's zone; NaN when the floor has no zones or the table no zone columns. */
  pathZone: number;
  likelyZone: number;
}

/** Distance (m, same level) within which a decoded cell counts as near the true one. */
export const NEAR_METRES = 1.5;

/**
 * Accuracy of an annotated CSV table with a `true_cell` column: exact cell, within 1.5 m (cell centres
 * on the same level) and zone, for `path_cell`/`path_zone` and `likely_cell`/`likely_zone`.
 */
export function annotatedAccuracy(floor: FloorGraph, csvText: string, name: string): AnnotatedAccuracy {
  const byId = new Map(floor.cells.map((c) => [c.id, c] as const));
  const t = parseCsv(csvText, name);
  const col = (column: string) => {
    const k = t.header.indexOf(column);
    return k < 0 ? null : t.columns[k];
  };
  const truth = col('true_cell');
  if (!truth) throw new Error(`${name}: no true_cell column`);
  const share = (cellColumn: string, zoneColumn: string): [number, number, number] => {
    const c = col(cellColumn);
    const z = col(zoneColumn);
    if (!c) throw new Error(`${name}: no ${cellColumn} column`);
    let exact = 0;
    let near = 0;
    let zone = 0;
    let zoned = 0;
    for (let r = 0; r < t.nRows; r++) {
      const a = byId.get(String(truth.get(r)));
      const b = byId.get(String(c.get(r)));
      if (a && a.zone !== undefined && z) {
        zoned++;
        if (z.get(r) === a.zone) zone++;
      }
      if (!a || !b) continue;
      if (a.id === b.id) exact++;
      if (a.level === b.level && Math.hypot(a.x - b.x, a.y - b.y) <= NEAR_METRES) near++;
    }
    return [exact / t.nRows, near / t.nRows, zoned ? zone / zoned : NaN];
  };
  const [pathExact, pathNear, pathZone] = share('path_cell', 'path_zone');
  const [likelyExact, likelyNear, likelyZone] = share('likely_cell', 'likely_zone');
  return { rows: t.nRows, pathExact, pathNear, likelyExact, likelyNear, pathZone, likelyZone };
}

/** Header and one row of the accuracy table printed by the benches. */
export const ACCURACY_HEADER = `${'table'.padEnd(34)} ${'path exact'.padStart(10)} ${'path ≤1.5m'.padStart(10)} ${'path zone'.padStart(10)} ${'likely exact'.padStart(12)} ${'likely ≤1.5m'.padStart(12)} ${'likely zone'.padStart(12)}`;

export function accuracyRow(label: string, a: AnnotatedAccuracy): string {
  const pct = (x: number, w: number): string => (Number.isNaN(x) ? '–' : `${(100 * x).toFixed(1)} %`).padStart(w);
  return `${label.padEnd(34)} ${pct(a.pathExact, 10)} ${pct(a.pathNear, 10)} ${pct(a.pathZone, 10)} ${pct(a.likelyExact, 12)} ${pct(a.likelyNear, 12)} ${pct(a.likelyZone, 12)}`;
}
