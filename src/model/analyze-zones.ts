import type { FloorGraph } from './floor-graph.js';

/** One zone of a floor as `check` lists it. */
export interface ZoneCount {
  zone: string;
  cells: number;
  /** Parts of the zone that do not touch: connected components of its cells through links (either direction). */
  parts: number;
}

export interface ZoneAnalysis {
  /** Zones in order of first appearance in the file; empty when no cell has a zone. */
  zones: ZoneCount[];
  /** Cells without a zone (each is decoded as an unnamed area of its own). */
  unzonedCells: number;
  warnings: string[];
}

/** Most ids named in one warning line. */
const MAX_IDS = 10;

/**
 * Cell counts per zone and zones split into parts that do not touch. Two cells of a zone touch when a
 * link joins them (one-way links count both ways); union-find over the links inside each zone. A split
 * zone is legal (e.g. two halves of a hall joined only through a corridor) but often a typing mistake,
 * and its zone posterior adds places a robot cannot cross between without leaving the zone.
 */
export function analyzeZones(floor: FloorGraph): ZoneAnalysis {
  const n = floor.cells.length;
  const index = new Map<string, number>(floor.cells.map((c, i) => [c.id, i]));
  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  };
  for (const link of floor.links) {
    const a = index.get(link.from);
    const b = index.get(link.to);
    if (a === undefined || b === undefined) continue;
    const za = floor.cells[a].zone;
    if (za === undefined || za !== floor.cells[b].zone) continue;
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  }
  const byZone = new Map<string, number[]>();
  let unzonedCells = 0;
  floor.cells.forEach((c, i) => {
    if (c.zone === undefined) unzonedCells++;
    else {
      const list = byZone.get(c.zone);
      if (list) list.push(i);
      else byZone.set(c.zone, [i]);
    }
  });
  const zones: ZoneCount[] = [];
  const warnings: string[] = [];
  for (const [zone, cells] of byZone) {
    const partSize = new Map<number, number>();
    for (const i of cells) partSize.set(find(i), (partSize.get(find(i)) ?? 0) + 1);
    zones.push({ zone, cells: cells.length, parts: partSize.size });
    if (partSize.size > 1) {
      let main = find(cells[0]);
      for (const [root, size] of partSize) if (size > (partSize.get(main) ?? 0)) main = root;
      const outside = cells.filter((i) => find(i) !== main).map((i) => JSON.stringify(floor.cells[i].id));
      const sizes = [...partSize.values()].sort((a, b) => b - a);
      const listed = outside.length > MAX_IDS ? `${outside.slice(0, MAX_IDS).join(', ')} and ${outside.length - MAX_IDS} more` : outside.join(', ');
      warnings.push(`zone ${JSON.stringify(zone)} falls into ${partSize.size} parts that do not touch (${sizes.join(', ')} cells); cells outside its largest part: ${listed}`);
    }
  }
  return { zones, unzonedCells: byZone.size ? unzonedCells : 0, warnings };
}
