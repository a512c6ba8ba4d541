import { describe, it, expect } from 'vitest';
import { refitStartRows } from '../../src/compare/refit-start-rows.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';

describe('refitStartRows', () => {
  // Invented 3 × 1 corridor: oak, carpet, oak; old rows as a fit might have left them.
  const model = buildModel(gridFloor(3, 1, ['oak', 'carpet'], (x) => (x === 1 ? 1 : 0)), { dwell: 0.5, hit: 0.8 });
  model.emission.set([0.9, 0.1, 0.3, 0.7, 0.7, 0.3]);
  it('survey: every cell reads its surveyed surface at the old rows\' mean hit rate', () => {
    const e = refitStartRows(model, 'survey');
    const hit = (0.9 + 0.7 + 0.7) / 3;
    [hit, 1 - hit, 1 - hit, hit, hit, 1 - hit].forEach((v, k) => expectClose(e[k], v, { abs: 1e-12 }));
  });
  it('sensor: every cell takes the mean old row of its surveyed surface', () => {
    const e = refitStartRows(model, 'sensor');
    [0.8, 0.2, 0.3, 0.7, 0.8, 0.2].forEach((v, k) => expectClose(e[k], v, { abs: 1e-12 }));
    expect(Array.from(model.emission)).toEqual([0.9, 0.1, 0.3, 0.7, 0.7, 0.3]); // the old model is untouched
  });
});
