import { describe, it, expect } from 'vitest';
import { floorGeometry } from '../../src/report/floor-geometry.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';

describe('floorGeometry(model)', () => {
  it('finds every link once, marks one-way links, separates links between levels and groups cells by level', () => {
    const floor: FloorGraph = gridFloor(3, 2, ['oak', 'tile'], (x) => x % 2);
    floor.links.push({ from: 'g-0-0', to: 'g-2-1', oneway: true });
    floor.cells.push({ id: 'up', surface: 'oak', x: 0.5, y: 0.5, level: 2, start: false }, { id: 'down', surface: 'oak', x: 9, y: 9, level: -1, start: false });
    floor.links.push({ from: 'g-1-0', to: 'up', oneway: false }, { from: 'down', to: 'g-1-1', oneway: true });
    const g = floorGeometry(buildModel(floor));
    // 3 × 2 grid: 7 two-way neighbour links + 1 one-way diagonal within level 0.
    expect(g.links.length).toBe(8);
    const ids = floor.cells.map((c) => c.id);
    const oneway = g.links.filter((l) => l.oneway).map((l) => `${ids[l.from]}>${ids[l.to]}`);
    expect(oneway).toEqual(['g-0-0>g-2-1']);
    expect(g.crossLinks.map((l) => `${ids[l.from]}${l.oneway ? '>' : '-'}${ids[l.to]}`).sort()).toEqual(['down>g-1-1', 'g-1-0-up']);
    expect(g.levels.map((l) => l.level)).toEqual([-1, 0, 2]);
    expect(g.levels[1].cells.length).toBe(6);
    expect([g.levels[1].minX, g.levels[1].maxX, g.levels[1].minY, g.levels[1].maxY]).toEqual([0.5, 2.5, 0.5, 1.5]);
  });

  it('takes the median link length as the grid pitch (a long diagonal does not change it)', () => {
    const floor = gridFloor(4, 4, ['oak'], () => 0);
    for (const c of floor.cells) {
      c.x *= 1.5;
      c.y *= 1.5;
    }
    floor.links.push({ from: 'g-0-0', to: 'g-3-3', oneway: false });
    expect(floorGeometry(buildModel(floor)).pitch).toBeCloseTo(1.5, 12);
  });

  it('uses a pitch of 1 for a floor without links within a level', () => {
    const floor: FloorGraph = {
      format: 'underfoot-floor/1',
      name: 'lift',
      surfaces: ['oak'],
      cells: [{ id: 'a', surface: 'oak', x: 0, y: 0, level: 0, start: false }, { id: 'b', surface: 'oak', x: 0, y: 0, level: 1, start: false }],
      links: [{ from: 'a', to: 'b', oneway: false }],
    };
    expect(floorGeometry(buildModel(floor)).pitch).toBe(1);
  });
});
