import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { learnedTransitionsMap } from '../../src/model/learned-transitions-map.js';
import { perCellDwellTransitions } from '../../src/model/per-cell-dwell-transitions.js';
import { transitionLogPrior } from '../../src/model/transition-log-prior.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';
import { maximizeModel } from '../../src/model/maximize-model.js';
import { buildModel } from '../../src/model/build-model.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';
import { fcSeed } from '../helpers/fc-seed.js';

// An invented 3 × 2 grid plus one one-way link: rows of 3 or 4 nonzeros.
const floor = gridFloor(3, 2, ['oak', 'tile'], (x, y) => (x + y) % 2);
floor.links.push({ from: 'g-0-0', to: 'g-2-1', oneway: true });
const model = buildModel(floor, { dwell: 0.5, hit: 0.8 });
const s = model.structure;
const centre = equalSplitTransitions(s, 0.5);

function randomCounts(seed: number): Float64Array {
  let x = seed;
  return Float64Array.from({ length: s.nnz }, () => ((x = (x * 16807) % 2147483647) / 2147483647) * 50);
}

describe('learnedTransitionsMap', () => {
  it('is (counts + W·centre) / (total + W) over each row, rows sum to 1, absent links stay zero', () => {
    const counts = randomCounts(7);
    const t = learnedTransitionsMap(s, counts, model.trans, 20, centre);
    for (let i = 0; i < s.nCells; i++) {
      let total = 0;
      let sum = 0;
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) total += counts[k];
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
        expectClose(t[k], (counts[k] + 20 * centre[k]) / (total + 20), { abs: 1e-15 }, `a[${k}]`);
        sum += t[k];
      }
      expectClose(sum, 1, { abs: 1e-12 }, `row ${i}`);
    }
    expect(t.length).toBe(s.nnz); // only nonzeros exist: nothing else can become nonzero
  });

  it('W = 0 is the maximum-likelihood row (and keeps a row without counts)', () => {
    const counts = randomCounts(3);
    for (let k = s.succPtr[2]; k < s.succPtr[3]; k++) counts[k] = 0;
    const t = learnedTransitionsMap(s, counts, model.trans, 0, centre);
    for (let k = s.succPtr[2]; k < s.succPtr[3]; k++) expect(t[k]).toBe(model.trans[k]);
    let total = 0;
    for (let k = s.succPtr[0]; k < s.succPtr[1]; k++) total += counts[k];
    for (let k = s.succPtr[0]; k < s.succPtr[1]; k++) expect(t[k]).toBe(counts[k] / total);
  });

  it('maximises counts·log a + transition log prior: no random row scores higher (property)', () => {
    const counts = randomCounts(11);
    const best = learnedTransitionsMap(s, counts, model.trans, 20, centre);
    const score = (t: Float64Array): number => {
      let v = 0;
      for (let k = 0; k < s.nnz; k++) v += counts[k] * Math.log(t[k]);
      return v + transitionLogPrior({ ...model, trans: t }, 'learned', 20, centre);
    };
    const top = score(best);
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0.01, max: 1, noNaN: true }), { minLength: s.nnz, maxLength: s.nnz }), (w) => {
        const t = Float64Array.from(w);
        for (let i = 0; i < s.nCells; i++) {
          let sum = 0;
          for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) sum += t[k];
          for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) t[k] /= sum;
        }
        return score(t) <= top + 1e-9;
      }),
      { seed: fcSeed, numRuns: 200 },
    );
  });
});

describe('perCellDwellTransitions', () => {
  it('gives each cell d_i = (D_i + W·d0) / (D_i + L_i + W), links equal, from per-link or totals counts', () => {
    const counts = randomCounts(5);
    const totals = new Float64Array(s.nnz);
    for (let i = 0; i < s.nCells; i++) {
      let links = 0;
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) if (k !== s.dwellPos[i]) links += counts[k];
      totals[s.dwellPos[i]] = counts[s.dwellPos[i]];
      const first = s.dwellPos[i] === s.succPtr[i] ? s.succPtr[i] + 1 : s.succPtr[i];
      totals[first] = links;
    }
    const a = perCellDwellTransitions(s, counts, model.trans, 15, 0.4);
    const b = perCellDwellTransitions(s, totals, model.trans, 15, 0.4);
    for (let i = 0; i < s.nCells; i++) {
      let total = 0;
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) total += counts[k];
      const d = (counts[s.dwellPos[i]] + 15 * 0.4) / (total + 15);
      const nLinks = s.succPtr[i + 1] - s.succPtr[i] - 1;
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
        expectClose(a[k], k === s.dwellPos[i] ? d : (1 - d) / nLinks, { abs: 1e-15 }, `a[${k}]`);
        expectClose(b[k], a[k], { abs: 1e-15 }, `totals form [${k}]`);
      }
    }
  });

  it('maximises the per-cell objective: a small change of any dwell scores lower', () => {
    const counts = randomCounts(9);
    const c = equalSplitTransitions(s, 0.4);
    const best = perCellDwellTransitions(s, counts, model.trans, 15, 0.4);
    const score = (t: Float64Array): number => {
      let v = 0;
      for (let k = 0; k < s.nnz; k++) v += counts[k] * Math.log(t[k]);
      return v + transitionLogPrior({ ...model, trans: t }, 'per-cell', 15, c);
    };
    for (let i = 0; i < s.nCells; i++) {
      for (const eps of [-1e-3, 1e-3]) {
        const t = best.slice();
        const d = t[s.dwellPos[i]] + eps;
        const nLinks = s.succPtr[i + 1] - s.succPtr[i] - 1;
        for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) t[k] = k === s.dwellPos[i] ? d : (1 - d) / nLinks;
        expect(score(t)).toBeLessThan(score(best));
      }
    }
  });

  it('maximizeModel in per-cell mode keeps the start and writes per-cell dwells', () => {
    const counts = emptyCounts(s.nCells, s.nnz, 2);
    counts.trans.set(randomCounts(13));
    const next = maximizeModel(model, counts, { mode: 'per-cell', priorStrength: 0, transitionPriorStrength: 10, transitionCentre: centre });
    expect(Array.from(next.start)).toEqual(Array.from(model.start));
    const dwells = new Set(Array.from(s.dwellPos, (k) => next.trans[k]));
    expect(dwells.size).toBeGreaterThan(1);
  });

  it('maximizeModel refuses a transition prior without its centre', () => {
    const counts = emptyCounts(s.nCells, s.nnz, 2);
    expect(() => maximizeModel(model, counts, { mode: 'learned', priorStrength: 0, transitionPriorStrength: 10 })).toThrow(/transitionCentre/);
  });
});
