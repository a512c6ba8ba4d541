import { describe, it, expect } from 'vitest';
import { findDisagreements } from '../../src/report/find-disagreements.js';
import { orderBySurvey } from '../../src/report/order-by-survey.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';

const surfaces = ['oak', 'carpet', 'tile'];

describe('findDisagreements(model) and orderBySurvey(model)', () => {
  const model = buildModel(gridFloor(3, 2, surfaces, (x) => x), { hit: 0.8 });
  // Cells: g-0-0 oak, g-1-0 carpet, g-2-0 tile, g-0-1 oak, g-1-1 carpet, g-2-1 tile.
  model.emission.set([0.2, 0.7, 0.1], 0 * 3); // oak cell reading carpet: disagreement by 0.5
  model.emission.set([0.45, 0.45, 0.1], 4 * 3); // carpet cell tied with oak: agreement (ties go to the survey)
  model.emission.set([0.5, 0.1, 0.4], 5 * 3); // tile cell reading oak: disagreement by 0.1

  it('finds cells whose most likely reading is not the surveyed one, largest gap first', () => {
    expect(findDisagreements(model)).toEqual([
      { cell: 0, likely: 1, likelyP: 0.7, surveyedP: 0.2 },
      { cell: 5, likely: 0, likelyP: 0.5, surveyedP: 0.4 },
    ]);
  });

  it('orders cells by surveyed surface, then by the probability of reading it, highest first', () => {
    // oak: g-0-1 (0.8) before g-0-0 (0.2); carpet: g-1-0 (0.8) before g-1-1 (0.45); tile: g-2-0 (0.8) before g-2-1 (0.4).
    expect(orderBySurvey(model)).toEqual([3, 0, 1, 4, 2, 5]);
  });
});
