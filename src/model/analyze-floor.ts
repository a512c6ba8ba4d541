import type { FloorGraph } from './floor-graph.js';
import { analyzeZones, type ZoneCount } from './analyze-zones.js';

/** Summary of a floor graph for `check`: sizes, levels, connectivity and the warnings to print. */
export interface FloorAnalysis {
  nCells: number;
  /** Links as declared in the file (a two-way link counts once). */
  nLinks: number;
  /** Moves along links (a two-way link counts twice); dwell moves are not counted. */
  nDirectedLinks: number;
  /** Distinct levels, ascending. */
  levels: number[];
  /** Weakly connected components (link directions ignored). */
  parts: number;
  /** Cells no run can reach from a start cell along links, in file order. Empty when no cell is a start. */
  unreachable: string[];
  /** Cells per surface, for every surface of the floor (zero included), in the floor's surface order. */
  surfaceCounts: Record<string, number>;
  /** Zones with their cell counts and parts, in file order; empty when the floor has no zones. */
  zones: ZoneCount[];
  /** Cells without a zone on a floor that has zones (0 when it has none). */
  unzonedCells: number;
  /** One readable line per finding (disconnected parts, unreachable cells). */
  warnings: string[];
}

/** Most ids named in one warning line. */
const MAX_IDS = 10;

/**
 * Counts and connectivity of a validated floor graph. Parts are found with union-find over links;
 * reachability by a breadth-first search over directed moves from every start cell (if no cell is marked
 * `start`, runs may begin anywhere, so every cell is reachable).
 */
export function analyzeFloor(floor: FloorGraph): FloorAnalysis {
  const nCells = floor.cells.length;
  const index = new Map<string, number>(floor.cells.map((cell, i) => [cell.id, i]));
  const from = new Int32Array(floor.links.length);
  const to = new Int32Array(floor.links.length);
  floor.links.forEach((link, k) => {
    const a = index.get(link.from);
    const b = index.get(link.to);
    if (a === undefined || b === undefined) {
      throw new RangeError(`analyzeFloor: link ${link.from} -> ${link.to} must join cells of the floor`);
    }
    from[k] = a;
    to[k] = b;
  });

  const parent = Int32Array.from({ length: nCells }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  };
  for (let k = 0; k < from.length; k++) {
    const a = find(from[k]);
    const b = find(to[k]);
    if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
  }
  const partSize = new Map<number, number>();
  for (let i = 0; i < nCells; i++) partSize.set(find(i), (partSize.get(find(i)) ?? 0) + 1);

  const unreachable = findUnreachable(floor, from, to);
  const surfaceCounts: Record<string, number> = {};
  for (const surface of floor.surfaces) surfaceCounts[surface] = 0;
  for (const cell of floor.cells) surfaceCounts[cell.surface] = (surfaceCounts[cell.surface] ?? 0) + 1;

  const warnings: string[] = [];
  if (partSize.size > 1) {
    // The largest part (first in file order on ties) is "the building"; name the cells outside it.
    let main = find(0);
    for (const [root, size] of partSize) if (size > (partSize.get(main) ?? 0)) main = root;
    const outside = floor.cells.filter((_, i) => find(i) !== main).map((cell) => cell.id);
    const sizes = [...partSize.values()].sort((a, b) => b - a);
    warnings.push(
      `the floor falls into ${partSize.size} disconnected parts (${sizes.join(', ')} cells); ` +
        `cells outside the largest: ${listIds(outside)}`,
    );
  }
  if (unreachable.length > 0) {
    warnings.push(`${unreachable.length} of ${nCells} cells cannot be reached from any start cell: ${listIds(unreachable)}`);
  }

  // Two cells at one position on one level: a survey slip (a copied row), and decoded coordinates there
  // cannot tell the cells apart.
  const at = new Map<string, string>();
  const shared: string[] = [];
  for (const cell of floor.cells) {
    const key = `${cell.level}:${cell.x}:${cell.y}`;
    const first = at.get(key);
    if (first === undefined) at.set(key, cell.id);
    else shared.push(`${JSON.stringify(first)} and ${JSON.stringify(cell.id)} at (${cell.x}, ${cell.y}) on level ${cell.level}`);
  }
  if (shared.length > 0) {
    warnings.push(`${shared.length} cell(s) share a position with another cell: ${shared.slice(0, 5).join('; ')}${shared.length > 5 ? `; and ${shared.length - 5} more` : ''}`);
  }

  const zoneAnalysis = analyzeZones(floor);
  warnings.push(...zoneAnalysis.warnings);

  let nDirectedLinks = 0;
  for (const link of floor.links) nDirectedLinks += link.oneway ? 1 : 2;
  return {
    nCells,
    nLinks: floor.links.length,
    nDirectedLinks,
    levels: [...new Set(floor.cells.map((cell) => cell.level))].sort((a, b) => a - b),
    parts: partSize.size,
    unreachable,
    surfaceCounts,
    zones: zoneAnalysis.zones,
    unzonedCells: zoneAnalysis.unzonedCells,
    warnings,
  };
}

function findUnreachable(floor: FloorGraph, from: Int32Array, to: Int32Array): string[] {
  const nCells = floor.cells.length;
  if (!floor.cells.some((cell) => cell.start)) return [];
  // Successor lists in CSR form: moves a -> b for every link, both ways unless one-way.
  const ptr = new Int32Array(nCells + 1);
  floor.links.forEach((link, k) => {
    ptr[from[k] + 1]++;
    if (!link.oneway) ptr[to[k] + 1]++;
  });
  for (let i = 0; i < nCells; i++) ptr[i + 1] += ptr[i];
  const fill = ptr.slice(0, nCells);
  const succ = new Int32Array(ptr[nCells]);
  floor.links.forEach((link, k) => {
    succ[fill[from[k]]++] = to[k];
    if (!link.oneway) succ[fill[to[k]]++] = from[k];
  });

  const seen = new Uint8Array(nCells);
  const queue = new Int32Array(nCells);
  let head = 0;
  let tail = 0;
  floor.cells.forEach((cell, i) => {
    if (cell.start) {
      seen[i] = 1;
      queue[tail++] = i;
    }
  });
  while (head < tail) {
    const a = queue[head++];
    for (let k = ptr[a]; k < ptr[a + 1]; k++) {
      const b = succ[k];
      if (!seen[b]) {
        seen[b] = 1;
        queue[tail++] = b;
      }
    }
  }
  return floor.cells.filter((_, i) => !seen[i]).map((cell) => cell.id);
}

function listIds(ids: string[]): string {
  const shown = ids.slice(0, MAX_IDS).map((id) => JSON.stringify(id));
  const more = ids.length - shown.length;
  return more > 0 ? `${shown.join(', ')} and ${more} more` : shown.join(', ');
}
