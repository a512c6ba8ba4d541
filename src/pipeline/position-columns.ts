import type { HmmModel } from '../model/hmm-model.js';
import type { PositionLayout } from '../decode/position-layout.js';
import type { OutputColumn } from '../io/output-table.js';

/** Per-row decoded values behind the zone and position columns (−1 / NaN where a row was not decoded). */
export interface PositionRows {
  pathCell: Int32Array;
  likelyZone: Int32Array;
  zoneP: Float64Array;
  meanLevel: Int32Array;
  meanX: Float64Array;
  meanY: Float64Array;
  spread: Float64Array;
}

/**
 * The annotated table's zone and position columns, in the contract's order, then `mean_level` (the
 * level `mean_x`/`mean_y` refer to). Always present so scripts see the same columns for every model:
 * without zones in the model `path_zone`, `likely_zone` and `zone_p` are empty. With zones, a cell
 * without a zone counts as an area of its own with no name: `path_zone` is empty on it, and an empty
 * `likely_zone` means that one unnamed cell (then `likely_cell`) holds more posterior than any zone.
 */
export function positionColumns(model: HmmModel, layout: PositionLayout, r: PositionRows): OutputColumn[] {
  const cells = model.cells;
  const { zoneNames, levels, hasZones } = layout;
  const zoneName = (z: number): string | null => (z < 0 || zoneNames[z] === '' ? null : zoneNames[z]);
  const num = (a: Float64Array) => (row: number) => (Number.isNaN(a[row]) ? null : a[row]);
  const ofPath = <V>(f: (i: number) => V) => (row: number): V | null => (r.pathCell[row] < 0 ? null : f(r.pathCell[row]));
  const none = (): null => null;
  return [
    { name: 'path_zone', kind: 'dictionary', get: hasZones ? ofPath((i) => cells[i].zone ?? null) : none },
    { name: 'likely_zone', kind: 'dictionary', get: hasZones ? (row) => zoneName(r.likelyZone[row]) : none },
    { name: 'zone_p', kind: 'float64', get: hasZones ? num(r.zoneP) : none },
    { name: 'path_x', kind: 'float64', get: ofPath((i) => cells[i].x) },
    { name: 'path_y', kind: 'float64', get: ofPath((i) => cells[i].y) },
    { name: 'path_level', kind: 'int32', get: ofPath((i) => cells[i].level) },
    { name: 'mean_x', kind: 'float64', get: num(r.meanX) },
    { name: 'mean_y', kind: 'float64', get: num(r.meanY) },
    { name: 'spread_m', kind: 'float64', get: num(r.spread) },
    { name: 'mean_level', kind: 'int32', get: (row) => (r.meanLevel[row] < 0 ? null : levels[r.meanLevel[row]]) },
  ];
}
