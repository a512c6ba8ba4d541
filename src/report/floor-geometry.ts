import type { HmmModel } from '../model/hmm-model.js';

/** One level of the building: its cells and their extent (metres, cell centres). */
export interface LevelGeometry {
  level: number;
  cells: number[];
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

/** A link between two cells; two-way links appear once (`from` < `to`), one-way ones as `from → to`. */
export interface GeometryLink {
  from: number;
  to: number;
  oneway: boolean;
}

export interface FloorGeometry {
  /** Levels in ascending order. */
  levels: LevelGeometry[];
  /** Typical distance between linked cell centres (median over links within a level); 1 when there are none. */
  pitch: number;
  /** Links within a level. */
  links: GeometryLink[];
  /** Links between levels (lifts, stairs drawn as one link). */
  crossLinks: GeometryLink[];
}

/**
 * The drawable shape of a model's floor: cells grouped by level, and its links read off the transition
 * structure (a move i → j without j → i is a one-way link). Dwell transitions are not links.
 */
export function floorGeometry(model: HmmModel): FloorGeometry {
  const s = model.structure;
  const cells = model.cells;
  const byLevel = new Map<number, number[]>();
  cells.forEach((c, i) => {
    const list = byLevel.get(c.level);
    if (list) list.push(i);
    else byLevel.set(c.level, [i]);
  });
  const levels = [...byLevel.keys()]
    .sort((a, b) => a - b)
    .map((level): LevelGeometry => {
      const members = byLevel.get(level) as number[];
      const xs = members.map((i) => cells[i].x);
      const ys = members.map((i) => cells[i].y);
      return { level, cells: members, minX: Math.min(...xs), maxX: Math.max(...xs), minY: Math.min(...ys), maxY: Math.max(...ys) };
    });
  const hasMove = (i: number, j: number): boolean => {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) if (s.succIdx[k] === j) return true;
    return false;
  };
  const links: GeometryLink[] = [];
  const crossLinks: GeometryLink[] = [];
  const lengths: number[] = [];
  for (let i = 0; i < s.nCells; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      const j = s.succIdx[k];
      if (j === i) continue;
      const back = hasMove(j, i);
      if (back && j < i) continue; // two-way: keep once
      const link = { from: i, to: j, oneway: !back };
      if (cells[i].level === cells[j].level) {
        links.push(link);
        const d = Math.hypot(cells[i].x - cells[j].x, cells[i].y - cells[j].y);
        if (d > 0) lengths.push(d);
      } else {
        crossLinks.push(link);
      }
    }
  }
  lengths.sort((a, b) => a - b);
  const pitch = lengths.length ? lengths[Math.floor((lengths.length - 1) / 2)] : 1;
  return { levels, pitch, links, crossLinks };
}
