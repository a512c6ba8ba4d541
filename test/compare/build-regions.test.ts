import { describe, it, expect } from 'vitest';
import { buildRegions } from '../../src/compare/build-regions.js';
import { compareCells } from '../../src/compare/compare-cells.js';
import { benjaminiHochberg } from '../../src/compare/benjamini-hochberg.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';

const surfaces = ['oak', 'carpet', 'tile', 'rubber'];
/** A 1-cell-wide corridor of the given surfaces (indices into `surfaces`), optionally zoned. */
function corridor(pattern: number[], zones?: string[]) {
  const floor = gridFloor(pattern.length, 1, surfaces, (x) => pattern[x]);
  if (zones) floor.cells.forEach((c, i) => (c.zone = zones[i]));
  return buildModel(floor, { dwell: 0.6, hit: 0.85 });
}
const ids = (model: ReturnType<typeof corridor>, regions: number[][]) => regions.map((r) => r.map((i) => model.cells[i].id).sort());

describe('buildRegions', () => {
  it('joins a stretch of one surface (along links) and look-alikes within reach (3 links); others stay single', () => {
    const model = corridor([0, 0, 0, 1, 2, 1]);
    const { regions, regionOf } = buildRegions(model, [0, 1, 2, 3, 4, 5]);
    expect(ids(model, regions)).toEqual([['g-0-0', 'g-1-0', 'g-2-0'], ['g-3-0', 'g-5-0'], ['g-4-0']]);
    expect(Array.from(regionOf)).toEqual([0, 0, 0, 1, 2, 1]);
  });

  it('never joins across zones', () => {
    const model = corridor([0, 0, 0, 1, 2, 1], ['a', 'a', 'b', 'b', 'b', 'c']);
    const { regions } = buildRegions(model, [0, 1, 2, 3, 4, 5]);
    expect(ids(model, regions)).toEqual([['g-0-0', 'g-1-0'], ['g-2-0'], ['g-3-0'], ['g-4-0'], ['g-5-0']]);
  });

  it('cells with no look-alike nearby are regions of their own', () => {
    const model = corridor([0, 1, 2, 3]);
    expect(buildRegions(model, [3, 2, 1, 0]).regions).toEqual([[3], [2], [1], [0]]);
  });

  it('forms regions around the strongest evidence first (look-alikes within reach are not chained)', () => {
    const model = corridor([0, 1, 0, 1, 0]);
    // Strongest at the middle oak cell: both oak cells within 2 links join it.
    expect(ids(model, buildRegions(model, [2, 1, 0, 3, 4]).regions)).toEqual([['g-0-0', 'g-2-0', 'g-4-0'], ['g-1-0', 'g-3-0']]);
    // Strongest at an end: only the oak cell 2 links away joins; the far end is not chained through it.
    expect(ids(model, buildRegions(model, [0, 4, 1, 2, 3]).regions)).toEqual([['g-0-0', 'g-2-0'], ['g-4-0'], ['g-1-0', 'g-3-0']]);
  });

  it('on a repeating pattern where every neighbour differs, no region comes near the whole building', () => {
    const floor = gridFloor(5, 4, surfaces, (x, y) => (x + 2 * y) % 4);
    const model = buildModel(floor, { dwell: 0.6, hit: 0.85 });
    const { regions } = buildRegions(model, Array.from({ length: 20 }, (_, i) => i));
    expect(regions.flat().sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, i) => i));
    // Same surface as cell (x, y) under the pattern (x + 2y) mod 4 within 3 links: (x, y ± 2) and
    // (x ± 2, y ± 1), at most 6 others.
    expect(Math.max(...regions.map((r) => r.length))).toBeLessThanOrEqual(7);
    // With a reach of 2 only (x, y ± 2).
    expect(Math.max(...buildRegions(model, Array.from({ length: 20 }, (_, i) => i), { lookAlikeTv: 0.2, reach: 2 }).regions.map((r) => r.length))).toBeLessThanOrEqual(3);
  });
});

describe('compareCells with regions', () => {
  // An invented 4 × 3 floor: a 2 × 2 oak room (zone "room") and eight cells of their own zones.
  const floor = gridFloor(4, 3, surfaces, (x, y) => (x < 2 && y < 2 ? 0 : 1 + ((x + 2 * y) % 3)));
  floor.cells.forEach((c) => (c.zone = c.x < 2 && c.y < 2 ? 'room' : c.id));
  const model = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const n = model.cells.length;
  const m = surfaces.length;
  const countsT = (rows: (i: number) => number[]) => {
    const t = new Float64Array(n * m);
    for (let i = 0; i < n; i++) rows(i).forEach((v, r) => (t[r * n + i] = v));
    return t;
  };
  const oldRow = (i: number) => Array.from({ length: m }, (_, r) => 1000 * model.emission[i * m + r]);
  const room = new Set(model.cells.flatMap((c, i) => (c.zone === 'room' ? [i] : [])));
  // The room re-floored a little in every cell (oak 0.85 → 0.825, carpet up): weak per cell, strong pooled.
  const newRow = (i: number) => (room.has(i) ? [825, 75, 50, 50] : oldRow(i));
  const opts = { fdr: 0.05, minReadings: 100, calibrate: false };

  it('tests the room as one unit: one region holding its four cells, reported changed; the rest unchanged', () => {
    const res = compareCells(model, countsT(oldRow), countsT(newRow), opts);
    const roomRows = res.changes.filter((c) => room.has(model.cells.findIndex((x) => x.id === c.cell)));
    const region = roomRows[0].region;
    expect(roomRows.every((c) => c.region === region && c.verdict === 'changed')).toBe(true);
    expect([...roomRows[0].candidates].sort()).toEqual(['g-0-0', 'g-0-1', 'g-1-0', 'g-1-1']);
    expect(res.changes.filter((c) => c.verdict === 'changed')).toHaveLength(4);
    // Cell by cell the same change is not found at this level.
    const single = compareCells(model, countsT(oldRow), countsT(newRow), { ...opts, regions: false });
    expect(single.changes.filter((c) => c.verdict === 'changed')).toHaveLength(0);
  });

  it('one worn cell in the room is not diluted in the pool: the region is reported, the cell leads its candidates', () => {
    const worn = model.cells.findIndex((c) => c.id === 'g-1-1');
    // The worn cell reads carpet half the time now; the other room cells are as before.
    const res = compareCells(model, countsT(oldRow), countsT((i) => (i === worn ? [450, 450, 50, 50] : oldRow(i))), opts);
    const row = res.changes.find((c) => c.cell === 'g-1-1')!;
    expect(row.verdict).toBe('changed');
    expect(row.candidates[0]).toBe('g-1-1');
    expect(row.candidates).toHaveLength(4);
    expect(res.regions.filter((r) => r.verdict === 'changed')).toHaveLength(1);
    // Its q-value: the region's p-value is 2 · 4 · (the cell's p-value) here (the strongest cell beats
    // the pooled test), times the number of regions for the smallest of them (Benjamini–Hochberg).
    expectClose(row.qValue!, 2 * 4 * row.pValue! * res.regions.length, { rel: 1e-9 });
  });

  it('controls the false-discovery rate over regions: q-values are Benjamini–Hochberg of the regions\' p-values', () => {
    const res = compareCells(model, countsT(oldRow), countsT(newRow), opts);
    expect(res.regions.length).toBe(n - 3);
    const q = benjaminiHochberg(res.regions.map((r) => r.pValue!));
    res.regions.forEach((r, k) => expectClose(r.qValue!, q[k], { rel: 1e-12 }));
    for (const c of res.changes) expect(c.qValue).toBe(res.regions.find((r) => r.region === c.region)!.qValue);
  });
});
