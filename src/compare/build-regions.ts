import type { HmmModel } from '../model/hmm-model.js';

export interface RegionOptions {
  /** Two cells look alike when the total variation distance between their old rows is at most this. @default 0.2 */
  lookAlikeTv: number;
  /** Look-alike cells within this many links of a cell may carry its change. @default 3 */
  reach: number;
}

export const DEFAULT_REGION_OPTIONS: RegionOptions = { lookAlikeTv: 0.2, reach: 3 };

/**
 * Cells grouped into disjoint regions that the runs cannot tell apart: where the old rows of nearby
 * cells look alike, readings explained by one of them are explained as well by the robot being at the
 * other, so a change shows at whichever cell the re-fit credits and no test can say which it was.
 *
 * - A *patch*: cells joined by links (either direction) whose old rows look alike (total variation
 *   ≤ `lookAlikeTv`) — a room of one surface, a corridor stretch. Transitive along links.
 * - A cell's *reach*: look-alike cells within `reach` links (not transitive: on a floor of repeating
 *   patterns chaining them would join the whole building).
 * - With zones (every cell carrying `zone`), nothing joins across a zone boundary.
 *
 * Regions are formed greedily in `order` (cells by strength of evidence, strongest first): the first
 * cell not yet in a region takes the rest of its patch and its reach. So a change credited to a
 * look-alike of the changed cell forms a region that holds the changed cell too. The default reach of 3
 * links was measured (bench/compare-fdr.ts, DEVELOPERS.md): on a floor of repeating surfaces the re-fit
 * credits changes to look-alikes 3 links away, which a reach of 2 misses. A cell with no
 * look-alike nearby is a region of its own (a change the runs place). Returns, per region, its cells in
 * `order`, and per cell its region's index.
 */
export function buildRegions(model: HmmModel, order: ReadonlyArray<number>, options: RegionOptions = DEFAULT_REGION_OPTIONS): { regions: number[][]; regionOf: Int32Array } {
  const n = model.cells.length;
  const m = model.surfaces.length;
  const { succPtr, succIdx } = model.structure;
  const adj: number[][] = Array.from({ length: n }, () => []);
  for (let i = 0; i < n; i++) {
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) {
      const j = succIdx[k];
      if (j !== i) {
        adj[i].push(j);
        adj[j].push(i);
      }
    }
  }
  const zoned = n > 0 && model.cells.every((c) => c.zone !== undefined);
  const alike = (i: number, j: number): boolean => {
    if (zoned && model.cells[i].zone !== model.cells[j].zone) return false;
    let tv = 0;
    for (let r = 0; r < m; r++) tv += Math.abs(model.emission[i * m + r] - model.emission[j * m + r]);
    return tv / 2 <= options.lookAlikeTv;
  };
  // Patches: components of the look-alike link graph.
  const patch = new Int32Array(n).fill(-1);
  const patches: number[][] = [];
  for (let s = 0; s < n; s++) {
    if (patch[s] >= 0) continue;
    const id = patches.length;
    const members = [s];
    patch[s] = id;
    for (let h = 0; h < members.length; h++) {
      const i = members[h];
      for (const j of adj[i]) if (patch[j] < 0 && alike(i, j)) {
        patch[j] = id;
        members.push(j);
      }
    }
    patches.push(members);
  }
  const rank = new Int32Array(n).fill(n);
  order.forEach((i, k) => (rank[i] = Math.min(rank[i], k)));
  const regionOf = new Int32Array(n).fill(-1);
  const regions: number[][] = [];
  const seen = new Int32Array(n).fill(-1);
  const byRank = Array.from({ length: n }, (_, i) => i).sort((a, b) => rank[a] - rank[b] || a - b);
  for (const s of byRank) {
    if (regionOf[s] >= 0) continue;
    const id = regions.length;
    const members = new Set<number>();
    for (const j of patches[patch[s]]) if (regionOf[j] < 0) members.add(j);
    // Cells within `reach` links of s (breadth first) that look like s.
    seen[s] = id;
    let frontier = [s];
    for (let d = 0; d < options.reach; d++) {
      const next: number[] = [];
      for (const i of frontier) {
        for (const j of adj[i]) {
          if (seen[j] === id) continue;
          seen[j] = id;
          next.push(j);
          if (regionOf[j] < 0 && alike(s, j)) members.add(j);
        }
      }
      frontier = next;
    }
    const cells = [...members].sort((a, b) => rank[a] - rank[b] || a - b);
    for (const j of cells) regionOf[j] = id;
    regions.push(cells);
  }
  return { regions, regionOf };
}
