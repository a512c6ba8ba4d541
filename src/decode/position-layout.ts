import type { HmmModel } from '../model/hmm-model.js';
import type { PositionGroups } from '../kernels/position-summary.js';

/** A model's cells grouped for `positionSummary`, with the names to print. */
export interface PositionLayout {
  groups: PositionGroups;
  /** True when at least one cell has a zone; without zones the zone columns are left empty. */
  hasZones: boolean;
  /** Name of each area: the named zones first (in order of first appearance), then '' for every cell without a zone. */
  zoneNames: string[];
  /** Level number of each level index (ascending). */
  levels: number[];
}

/**
 * Groups the model's cells into areas and levels. Every named zone is one area; every cell without a
 * zone is an area of its own with an empty name (so on a floor with no zones at all, areas are cells).
 * Each level's origin is the centroid of its cells.
 */
export function positionLayout(model: HmmModel): PositionLayout {
  const n = model.cells.length;
  const zoneIndex = new Map<string, number>();
  for (const c of model.cells) if (c.zone !== undefined && !zoneIndex.has(c.zone)) zoneIndex.set(c.zone, zoneIndex.size);
  const zoneNames = [...zoneIndex.keys()];
  const zoneOf = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const zone = model.cells[i].zone;
    if (zone !== undefined) zoneOf[i] = zoneIndex.get(zone) as number;
    else {
      zoneOf[i] = zoneNames.length;
      zoneNames.push('');
    }
  }
  const levels = [...new Set(model.cells.map((c) => c.level))].sort((a, b) => a - b);
  const levelIndex = new Map(levels.map((l, k) => [l, k] as const));
  const levelOf = Int32Array.from(model.cells, (c) => levelIndex.get(c.level) as number);
  const originX = new Float64Array(levels.length);
  const originY = new Float64Array(levels.length);
  const count = new Float64Array(levels.length);
  model.cells.forEach((c, i) => {
    originX[levelOf[i]] += c.x;
    originY[levelOf[i]] += c.y;
    count[levelOf[i]]++;
  });
  for (let l = 0; l < levels.length; l++) {
    originX[l] /= count[l];
    originY[l] /= count[l];
  }
  const dx = Float64Array.from(model.cells, (c, i) => c.x - originX[levelOf[i]]);
  const dy = Float64Array.from(model.cells, (c, i) => c.y - originY[levelOf[i]]);
  return {
    groups: { nZones: zoneNames.length, zoneOf, nLevels: levels.length, levelOf, dx, dy, originX, originY },
    hasZones: zoneIndex.size > 0,
    zoneNames,
    levels,
  };
}
