import { describe, it, expect } from 'vitest';
import { analyzeZones } from '../../src/model/analyze-zones.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';

// Invented floors. A row of cells a–f; links as given; zones as given.
function row(zones: Array<string | undefined>, links: Array<[number, number, boolean?]>): FloorGraph {
  const ids = zones.map((_, i) => String.fromCharCode(97 + i));
  return {
    format: 'underfoot-floor/1',
    name: 'row',
    surfaces: ['oak'],
    cells: ids.map((id, i) => ({ id, surface: 'oak', x: i, y: 0, level: 0, start: false, ...(zones[i] === undefined ? {} : { zone: zones[i] }) })),
    links: links.map(([a, b, oneway]) => ({ from: ids[a], to: ids[b], oneway: oneway === true })),
  };
}

describe('analyzeZones(floor)', () => {
  it('counts cells per zone in file order and no parts warning for connected zones; a one-way link joins a zone', () => {
    const a = analyzeZones(row(['A', 'A', 'B', 'B', undefined], [[0, 1, true], [1, 2], [2, 3], [3, 4]]));
    expect(a.zones).toEqual([{ zone: 'A', cells: 2, parts: 1 }, { zone: 'B', cells: 2, parts: 1 }]);
    expect(a.unzonedCells).toBe(1);
    expect(a.warnings).toEqual([]);
  });

  it('a zone whose cells touch only through another zone is split: one warning naming the cells outside its largest part', () => {
    const a = analyzeZones(row(['A', 'A', 'B', 'A', 'A', 'A'], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 5]]));
    expect(a.zones[0]).toEqual({ zone: 'A', cells: 5, parts: 2 });
    expect(a.warnings).toEqual(['zone "A" falls into 2 parts that do not touch (3, 2 cells); cells outside its largest part: "a", "b"']);
  });

  it('a floor without zones has no zones, no unzoned count and no warnings', () => {
    expect(analyzeZones(row([undefined, undefined], [[0, 1]]))).toEqual({ zones: [], unzonedCells: 0, warnings: [] });
  });
});
