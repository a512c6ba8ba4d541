import type { FloorGraph } from '../../src/model/floor-graph.js';

/**
 * An invented w × h grid floor (4-neighbour links, two-way), cell surfaces chosen from `pattern`
 * (a function of column and row). For tests only.
 */
export function gridFloor(w: number, h: number, surfaces: string[], pattern: (x: number, y: number) => number, name = 'test grid'): FloorGraph {
  const id = (x: number, y: number): string => `g-${x}-${y}`;
  const cells = [];
  const links = [];
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      cells.push({ id: id(x, y), surface: surfaces[pattern(x, y) % surfaces.length], x: x + 0.5, y: y + 0.5, level: 0, start: false });
      if (x + 1 < w) links.push({ from: id(x, y), to: id(x + 1, y), oneway: false });
      if (y + 1 < h) links.push({ from: id(x, y), to: id(x, y + 1), oneway: false });
    }
  }
  return { format: 'underfoot-floor/1', name, surfaces, cells, links };
}
