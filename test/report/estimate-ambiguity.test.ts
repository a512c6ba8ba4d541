import { describe, it, expect } from 'vitest';
import { estimateAmbiguity } from '../../src/report/estimate-ambiguity.js';
import { buildModel } from '../../src/model/build-model.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';

/** Invented: two mirror-image rooms of four distinct surfaces, joined through a one-cell tiled hall. */
function twinRooms(): { floor: FloorGraph; mirror: Map<string, string> } {
  const cell = (id: string, surface: string, x: number, y: number) => ({ id, surface, x, y, level: 0, start: false });
  const cells = [
    cell('A-oak', 'oak', 0.5, 0.5), cell('A-carpet', 'carpet', 1.5, 0.5), cell('A-rubber', 'rubber', 0.5, 1.5), cell('A-laminate', 'laminate', 1.5, 1.5),
    cell('hall', 'tile', 2.5, 0.5),
    cell('B-carpet', 'carpet', 3.5, 0.5), cell('B-oak', 'oak', 4.5, 0.5), cell('B-laminate', 'laminate', 3.5, 1.5), cell('B-rubber', 'rubber', 4.5, 1.5),
  ];
  const link = (from: string, to: string) => ({ from, to, oneway: false });
  const links = [
    link('A-oak', 'A-carpet'), link('A-oak', 'A-rubber'), link('A-carpet', 'A-laminate'), link('A-rubber', 'A-laminate'),
    link('B-oak', 'B-carpet'), link('B-oak', 'B-rubber'), link('B-carpet', 'B-laminate'), link('B-rubber', 'B-laminate'),
    link('A-carpet', 'hall'), link('hall', 'B-carpet'),
  ];
  const mirror = new Map<string, string>();
  for (const s of ['oak', 'carpet', 'rubber', 'laminate']) {
    mirror.set(`A-${s}`, `B-${s}`);
    mirror.set(`B-${s}`, `A-${s}`);
  }
  return { floor: { format: 'underfoot-floor/1', name: 'twin rooms', surfaces: ['oak', 'carpet', 'rubber', 'laminate', 'tile'], cells, links }, mirror };
}

describe('estimateAmbiguity(model, options)', () => {
  it('two cells with identical readings and symmetric moves are each recovered exactly half the time', () => {
    // Exact: readings carry no information, so the posterior is the (uniform, symmetric) prior, ½ each.
    const floor = gridFloor(2, 1, ['oak', 'tile'], () => 0);
    const a = estimateAmbiguity(buildModel(floor, { hit: 0.9 }), { runs: 20, steps: 50, seed: 3 });
    for (let i = 0; i < 2; i++) {
      expectClose(a.recovery[i], 0.5, { abs: 1e-12 });
      expectClose(a.nearRecovery[i], 1, { abs: 1e-12 });
      expect(a.ambiguous[i]).toBe(0); // not below one half
    }
  });

  it('cells that each read a surface of their own with certainty are recovered every time', () => {
    const floor = gridFloor(3, 1, ['oak', 'carpet', 'tile'], (x) => x);
    const a = estimateAmbiguity(buildModel(floor, { hit: 1 }), { runs: 10, steps: 40, seed: 1 });
    for (let i = 0; i < 3; i++) {
      expectClose(a.recovery[i], 1, { abs: 1e-12 });
      expectClose(a.errorM[i], 0, { abs: 1e-12 });
    }
  });

  it('rates the cells of two identical, symmetric rooms as ambiguous, each mistaken for its mirror cell', () => {
    const { floor, mirror } = twinRooms();
    const model = buildModel(floor, { hit: 0.9 });
    const a = estimateAmbiguity(model, { runs: 60, steps: 150, seed: 7 });
    const ids = model.cells.map((c) => c.id);
    for (let i = 0; i < ids.length; i++) {
      if (ids[i] === 'hall') {
        expect(a.recovery[i], 'the hall is the only tiled cell').toBeGreaterThan(0.8);
        expect(a.ambiguous[i]).toBe(0);
        continue;
      }
      // Symmetry makes the posterior of a cell equal that of its mirror cell, so recovery ≤ ½ exactly.
      expect(a.recovery[i], ids[i]).toBeLessThanOrEqual(0.5 + 1e-12);
      expect(a.recovery[i], ids[i]).toBeGreaterThan(0.3);
      expect(a.ambiguous[i], ids[i]).toBe(1);
      expect(ids[a.confusedWith[i]], ids[i]).toBe(mirror.get(ids[i]));
      expect(a.errorM[i], `${ids[i]} is often placed in the other room`).toBeGreaterThan(1);
    }
  });

  it('rates a floor with a distinct surface in every cell as mostly recoverable', () => {
    const surfaces = ['s0', 's1', 's2', 's3', 's4', 's5', 's6', 's7', 's8'];
    const floor = gridFloor(3, 3, surfaces, (x, y) => x + 3 * y);
    const a = estimateAmbiguity(buildModel(floor, { hit: 0.85 }), { runs: 40, steps: 150, seed: 2 });
    const recovered = Array.from(a.recovery).filter((r) => r >= 0.5).length;
    expect(recovered / 9).toBeGreaterThanOrEqual(0.9);
    expect(a.ambiguous.reduce((s, x) => s + x, 0)).toBeLessThanOrEqual(1);
  });

  it('is seeded: the same seed gives the same estimate, another seed another sample', () => {
    const { floor } = twinRooms();
    const model = buildModel(floor, { hit: 0.9 });
    const a = estimateAmbiguity(model, { runs: 5, steps: 80, seed: 11 });
    const b = estimateAmbiguity(model, { runs: 5, steps: 80, seed: 11 });
    const c = estimateAmbiguity(model, { runs: 5, steps: 80, seed: 12 });
    expect(Array.from(b.recovery)).toEqual(Array.from(a.recovery));
    expect(Array.from(c.visits)).not.toEqual(Array.from(a.visits));
    expect(a.visits.reduce((s, v) => s + v, 0)).toBe(5 * 80);
    expect(a.nSteps).toBe(400);
  });

  it('leaves cells without enough simulated visits unrated (NaN recovery when never visited)', () => {
    // A one-way chain from the only start cell: the last cells are reached late or never in 3 steps.
    const floor: FloorGraph = {
      format: 'underfoot-floor/1',
      name: 'chain',
      surfaces: ['oak', 'tile'],
      cells: [0, 1, 2, 3, 4].map((k) => ({ id: `c${k}`, surface: k % 2 ? 'tile' : 'oak', x: k, y: 0, level: 0, start: k === 0 })),
      links: [0, 1, 2, 3].map((k) => ({ from: `c${k}`, to: `c${k + 1}`, oneway: true })).concat([{ from: 'c4', to: 'c0', oneway: true }]),
    };
    const a = estimateAmbiguity(buildModel(floor, { hit: 0.9 }), { runs: 10, steps: 3, seed: 1, minVisits: 5 });
    expect(a.visits[4]).toBe(0);
    expect(Number.isNaN(a.recovery[4])).toBe(true);
    expect(a.ambiguous[4]).toBe(0);
    expect(a.visits[0]).toBeGreaterThanOrEqual(10);
  });

  it('per zone: one zone over the whole floor is recovered exactly; single-cell zones score as their cells; mirror-image rooms confuse each other', () => {
    const { floor } = twinRooms();
    const whole = buildModel({ ...floor, cells: floor.cells.map((c) => ({ ...c, zone: 'everything' })) }, { hit: 0.8 });
    const a = estimateAmbiguity(whole, { runs: 10, steps: 80, seed: 2 });
    expect(a.zones.map((z) => z.zone)).toEqual(['everything']);
    expectClose(a.zones[0].recovery, 1, { abs: 1e-12 });
    expect(a.zones[0].visits).toBe(800);
    expect(a.zones[0].confusedWith).toBe(-1);

    const single = buildModel({ ...floor, cells: floor.cells.map((c) => ({ ...c, zone: `z ${c.id}` })) }, { hit: 0.8 });
    const b = estimateAmbiguity(single, { runs: 10, steps: 80, seed: 2 });
    b.zones.forEach((z, k) => {
      expect(z.visits).toBe(b.visits[k]);
      if (z.visits > 0) {
        expectClose(z.recovery, b.recovery[k], { abs: 1e-12 }, z.zone);
        expectClose(z.cellRecovery, b.recovery[k], { abs: 1e-12 }, z.zone);
      }
    });

    // Rooms A and B are mirror images with the hall between them: each room is mistaken for the other.
    const rooms = buildModel({ ...floor, cells: floor.cells.map((c) => (c.id === 'hall' ? c : { ...c, zone: c.id.startsWith('A-') ? 'Room A' : 'Room B' })) }, { hit: 0.95 });
    const c = estimateAmbiguity(rooms, { runs: 40, steps: 100, seed: 5 });
    expect(c.zones.map((z) => z.zone)).toEqual(['Room A', 'Room B']);
    for (const [k, other] of [[0, 1], [1, 0]]) {
      expect(c.zones[k].confusedWith).toBe(other);
      expect(c.zones[k].recovery).toBeGreaterThan(c.zones[k].cellRecovery);
      expect(c.zones[k].recovery).toBeLessThan(1);
    }
  });
  it('with movement parameters, simulates odometry and decodes with it: a plain corridor is recovered far better', () => {
    // Invented: a 10-cell corridor of one surface with a carpet mat at the west end. Without odometry the
    // readings say almost nothing about which cell the robot is in; with distances and headings the
    // decoder dead-reckons from the mat. The walks are the same in both estimates (odometry has its own
    // generator), so the difference is odometry alone.
    const floor = gridFloor(10, 1, ['tile', 'carpet'], (x) => (x === 0 ? 1 : 0));
    const plain = buildModel(floor, { hit: 0.9 });
    const withMovement = { ...plain, movement: { stayLogit: 4, stayPerMetre: 20, kappa: 4 } };
    const a = estimateAmbiguity(plain, { runs: 20, steps: 200, seed: 4 });
    const b = estimateAmbiguity(withMovement, { runs: 20, steps: 200, seed: 4 });
    expect(a.odometry).toBe(false);
    expect(b.odometry).toBe(true);
    expect(Array.from(b.visits)).toEqual(Array.from(a.visits));
    const mean = (x: Float64Array): number => Array.from(x).reduce((s, v) => s + v, 0) / x.length;
    const weighted = (e: typeof a): number => Array.from(e.recovery).reduce((s, r, i) => s + r * e.visits[i], 0) / e.nSteps;
    expect(weighted(b), `recovery with odometry ${weighted(b).toFixed(3)} vs without ${weighted(a).toFixed(3)}`).toBeGreaterThan(weighted(a) + 0.2);
    expect(mean(b.errorM)).toBeLessThan(mean(a.errorM));
  });
});
