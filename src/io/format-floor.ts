import type { FloorGraph } from '../model/floor-graph.js';
import { formatJson } from './format-json.js';

/** The text of an `underfoot-floor/1` file (used by `compare --write-floor`). Optional fields at their defaults are left out. */
export function formatFloor(floor: FloorGraph): string {
  return (
    `${formatJson({
      format: 'underfoot-floor/1',
      name: floor.name,
      surfaces: floor.surfaces,
      cells: floor.cells.map((c) => ({ id: c.id, surface: c.surface, x: c.x, y: c.y, level: c.level, ...(c.start ? { start: true } : {}), ...(c.zone !== undefined ? { zone: c.zone } : {}) })),
      links: floor.links.map((l) => ({ from: l.from, to: l.to, ...(l.oneway ? { oneway: true } : {}) })),
      ...(floor.georeference ? { georeference: floor.georeference } : {}),
    })}\n`
  );
}
