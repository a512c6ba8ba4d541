import type { FloorGraph } from './floor-graph.js';
import type { HmmModel } from './hmm-model.js';
import { buildStructure } from './build-structure.js';
import { surveyPrior } from './survey-prior.js';
import { equalSplitTransitions } from './equal-split-transitions.js';

export interface BuildModelOptions {
  /** Dwell (stay-put) probability of every cell that has links. @default 0.5 */
  dwell?: number;
  /** Probability that a cell reads as its surveyed surface. @default 0.8 */
  hit?: number;
}

/**
 * Builds the starting model of a floor graph: transitions along links (two-way unless one-way) plus
 * dwell, with dwell `dwell` and the rest split equally over a cell's links; start uniform over the
 * `start` cells (over all cells when none is marked); emission rows at the survey prior.
 */
export function buildModel(floor: FloorGraph, options: BuildModelOptions = {}): HmmModel {
  const dwell = options.dwell ?? 0.5;
  const hit = options.hit ?? 0.8;
  if (!(dwell > 0 && dwell < 1)) throw new RangeError(`buildModel: dwell must be in (0, 1), got ${dwell}`);
  if (!(hit > 0 && hit <= 1)) throw new RangeError(`buildModel: hit must be in (0, 1], got ${hit}`);
  const index = new Map<string, number>();
  floor.cells.forEach((c, i) => index.set(c.id, i));
  const edges: Array<[number, number]> = [];
  for (const link of floor.links) {
    const a = index.get(link.from);
    const b = index.get(link.to);
    if (a === undefined || b === undefined) throw new RangeError(`buildModel: link ${link.from} → ${link.to} names an unknown cell`);
    edges.push([a, b]);
    if (!link.oneway) edges.push([b, a]);
  }
  const n = floor.cells.length;
  const structure = buildStructure(n, edges);
  const nStart = floor.cells.filter((c) => c.start).length;
  const start = new Float64Array(n);
  for (let i = 0; i < n; i++) start[i] = nStart === 0 ? 1 / n : floor.cells[i].start ? 1 / nStart : 0;
  const surfaceIndex = new Map(floor.surfaces.map((s, r) => [s, r] as const));
  const surfaceOfCell = Int32Array.from(floor.cells, (c) => surfaceIndex.get(c.surface) ?? -1);
  return {
    surfaces: floor.surfaces.slice(),
    cells: floor.cells.map((c) => ({ id: c.id, surface: c.surface, x: c.x, y: c.y, level: c.level, ...(c.zone !== undefined ? { zone: c.zone } : {}) })),
    structure,
    start,
    trans: equalSplitTransitions(structure, dwell),
    emission: surveyPrior(surfaceOfCell, floor.surfaces.length, hit),
  };
}
