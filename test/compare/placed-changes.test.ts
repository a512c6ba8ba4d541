import { describe, it, expect } from 'vitest';
import { placedChanges } from '../../src/compare/placed-changes.js';
import type { CellChange, RegionChange } from '../../src/compare/compare-cells.js';

const row = (cell: string, surfaceAfter: string, region: string): CellChange => ({
  cell, surfaceBefore: 'oak', surfaceAfter, expectedReadings: 400, tvDistance: 0.5, gStat: 50, pValue: 1e-6, qValue: 1e-5, verdict: 'changed', region, candidates: [], explanation: '',
});
const region = (id: string, cells: string[], verdict: RegionChange['verdict']): RegionChange => ({ region: id, cells, expectedReadings: 400, gStat: 50, pValue: 1e-6, qValue: 1e-5, verdict });

describe('placedChanges (what --write-floor writes)', () => {
  it('writes only reported changes placed on one cell, and only where the surface differs from the survey', () => {
    const changes = [row('a', 'carpet', 'R1'), row('b', 'carpet', 'R2'), row('c', 'carpet', 'R2'), row('d', 'oak', 'R3'), row('e', 'tile', 'R4')];
    const regions = [region('R1', ['a'], 'changed'), region('R2', ['b', 'c'], 'changed'), region('R3', ['d'], 'changed'), region('R4', ['e'], 'unchanged')];
    const out = placedChanges({ changes, regions }, () => 'oak');
    expect([...out]).toEqual([['a', 'carpet']]);
  });
});
