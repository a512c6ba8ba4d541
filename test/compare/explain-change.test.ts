import { describe, it, expect } from 'vitest';
import { explainChange, type ExplainInput } from '../../src/compare/explain-change.js';

const base: ExplainInput = {
  surfaces: ['oak', 'carpet', 'tile'],
  oldRow: [0.1, 0.14, 0.76],
  newCounts: [20, 310, 170],
  verdict: 'changed',
  pValue: 1e-9,
  region: 'R1',
  regionSize: 1,
  fdr: 0.05,
  minReadings: 100,
};

describe('explainChange', () => {
  it('says what a placed cell reads now and read before', () => {
    expect(explainChange(base)).toBe('Reads carpet 62 % of the time, was tile 76 %: flagged, and the runs place the change on this cell.');
  });
  it('says why a cell whose most likely reading did not change is flagged: its whole table shifted', () => {
    const s = explainChange({ ...base, newCounts: [150, 20, 330] });
    expect(s).toBe('Reads tile 66 % of the time (was 76 %): flagged because its most likely reading is the same, but its whole reading table shifted (oak 30 % now, was 10 %; total variation 0.20).');
  });
  it('names the region when the runs cannot tell its cells apart, and says when the cell alone shows little', () => {
    expect(explainChange({ ...base, regionSize: 4, region: 'R2' })).toBe('Reads carpet 62 % of the time, was tile 76 %: flagged; region R2 holds 4 cells that read alike and that the runs cannot tell apart, so the change could be at any of them.');
    expect(explainChange({ ...base, regionSize: 4, region: 'R2', pValue: 0.4, newCounts: [50, 70, 380] })).toMatch(/^Reads tile 76 % of the time \(was 76 %\): its own readings alone are not conclusive; flagged because region R2 holds 4 cells/);
  });
  it('a cell of a reported region with too few readings of its own says so', () => {
    expect(explainChange({ ...base, regionSize: 10, region: 'R3', pValue: null, newCounts: [5, 36, 7] })).toBe(
      'Reads carpet 75 % of the time, was tile 76 %: too few readings of its own to be tested (48 expected); flagged because region R3 holds 10 cells that read alike and that the runs cannot tell apart, so the change could be at any of them.',
    );
  });
  it('unchanged and untested rows get a sentence too', () => {
    expect(explainChange({ ...base, verdict: 'unchanged', newCounts: [50, 70, 380] })).toBe('Reads tile 76 % of the time (was 76 %): no change shown at false-discovery rate 0.05.');
    expect(explainChange({ ...base, verdict: 'too-few-readings', newCounts: [10, 20, 12] })).toBe('Only 42 expected readings in the new runs, fewer than 100: not tested; the runs rarely visit it.');
  });
});
