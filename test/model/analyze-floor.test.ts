import { describe, expect, it } from 'vitest';
import { parseFloor } from '../../src/io/parse-floor.js';
import { analyzeFloor } from '../../src/model/analyze-floor.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';

// The expected counts below are worked out by hand from each invented floor (drawn in the comments);
// the rules come from the file formats (docs/formats.md), "Floor file" (start cells, one-way links, warnings).

function floor(cells: Array<[string, string, number, boolean?]>, links: Array<[string, string, boolean?]>): FloorGraph {
  return parseFloor(
    JSON.stringify({
      format: 'underfoot-floor/1',
      name: 'Larkspur Clinic',
      surfaces: ['tile', 'rubber', 'carpet'],
      cells: cells.map(([id, surface, level, start], i) => ({ id, surface, x: i, y: 0, level, start: start ?? false })),
      links: links.map(([from, to, oneway]) => ({ from, to, oneway: oneway ?? false })),
    }),
    'clinic.json',
  );
}

describe('analyzeFloor(floor)', () => {
  it('analyzeFloor(floor) counts cells, links, moves, levels and surfaces of a connected floor', () => {
    // L1 <-> L2 -> L3 <-> L1, L3 on level 2 (stairs), L2 on level -1.
    const result = analyzeFloor(
      floor(
        [
          ['L1', 'tile', 0, true],
          ['L2', 'tile', -1],
          ['L3', 'rubber', 2],
        ],
        [
          ['L1', 'L2'],
          ['L2', 'L3', true],
          ['L3', 'L1'],
        ],
      ),
    );
    expect(result).toEqual({
      nCells: 3,
      nLinks: 3,
      nDirectedLinks: 5,
      levels: [-1, 0, 2],
      parts: 1,
      unreachable: [],
      surfaceCounts: { tile: 2, rubber: 1, carpet: 0 },
      zones: [],
      unzonedCells: 0,
      warnings: [],
    });
  });

  it('analyzeFloor(floor) finds disconnected parts and warns, naming the cells outside the largest', () => {
    // Part 1: A <-> B <-> C; part 2: D <-> E; part 3: F -> G -> F (two one-way links).
    const result = analyzeFloor(
      floor(
        [
          ['A', 'tile', 0],
          ['B', 'tile', 0],
          ['C', 'tile', 0],
          ['D', 'carpet', 0],
          ['E', 'carpet', 0],
          ['F', 'rubber', 1],
          ['G', 'rubber', 1],
        ],
        [
          ['A', 'B'],
          ['B', 'C'],
          ['D', 'E'],
          ['F', 'G', true],
          ['G', 'F', true],
        ],
      ),
    );
    expect(result.parts).toBe(3);
    expect(result.unreachable).toEqual([]);
    expect(result.warnings).toEqual([
      'the floor falls into 3 disconnected parts (3, 2, 2 cells); cells outside the largest: "D", "E", "F", "G"',
    ]);
  });

  it('analyzeFloor(floor) finds cells that no start cell reaches along one-way links', () => {
    // S -> X (one-way), X <-> Y, Z -> S (one-way) with Z <-> W: from S, Z and W are unreachable.
    const result = analyzeFloor(
      floor(
        [
          ['S', 'tile', 0, true],
          ['X', 'tile', 0],
          ['Y', 'tile', 0],
          ['Z', 'tile', 0],
          ['W', 'tile', 0],
        ],
        [
          ['S', 'X', true],
          ['X', 'Y'],
          ['Z', 'S', true],
          ['Z', 'W'],
          ['Y', 'S', true],
        ],
      ),
    );
    expect(result.parts).toBe(1);
    expect(result.unreachable).toEqual(['Z', 'W']);
    expect(result.warnings).toEqual(['2 of 5 cells cannot be reached from any start cell: "Z", "W"']);
  });

  it('analyzeFloor(floor) treats every cell as a start when none is marked', () => {
    const result = analyzeFloor(
      floor(
        [
          ['S', 'tile', 0],
          ['X', 'tile', 0],
          ['Z', 'tile', 0],
        ],
        [
          ['S', 'X'],
          ['Z', 'S', true],
        ],
      ),
    );
    expect(result.unreachable).toEqual([]);
    expect(result.warnings).toEqual([]);
  });

  it('analyzeFloor(floor) lists at most 10 ids in a warning, then "and N more"', () => {
    // Start H <-> K; a one-way ring q0 -> q1 -> ... -> q11 -> q0 whose only other link, q0 -> K, points
    // out of it: nothing leads into the ring, so its 12 cells are unreachable.
    const cells: Array<[string, string, number, boolean?]> = [['H', 'tile', 0, true], ['K', 'tile', 0]];
    const links: Array<[string, string, boolean?]> = [['H', 'K']];
    for (let i = 0; i < 12; i++) {
      cells.push([`q${i}`, 'carpet', 0]);
      links.push([`q${i}`, `q${(i + 1) % 12}`, true]);
    }
    links.push(['q0', 'K', true]);
    const result = analyzeFloor(floor(cells, links));
    expect(result.unreachable).toHaveLength(12);
    expect(result.warnings).toEqual([
      '12 of 14 cells cannot be reached from any start cell: "q0", "q1", "q2", "q3", "q4", "q5", "q6", "q7", "q8", "q9" and 2 more',
    ]);
  });

  it('analyzeFloor(floor) warns about two cells at one position on one level, not across levels', () => {
    const base = floor([['A', 'tile', 0, true], ['B', 'tile', 0], ['C', 'rubber', 1]], [['A', 'B'], ['B', 'C']]);
    // A and B surveyed at the same spot (a copied row); C is above A on another level (a lift): fine.
    const cells = base.cells.map((c) => (c.id === 'B' ? { ...c, x: 0 } : c.id === 'C' ? { ...c, x: 0 } : c));
    const result = analyzeFloor({ ...base, cells });
    expect(result.warnings).toEqual(['1 cell(s) share a position with another cell: "A" and "B" at (0, 0) on level 0']);
  });
});
