import { describe, it, expect } from 'vitest';
import { emIteration } from '../../src/fit/em-iteration.js';
import { buildModel } from '../../src/model/build-model.js';
import { surveyPrior } from '../../src/model/survey-prior.js';
import { WorkError } from '../../src/errors.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';

// Invented three-cell corridor; runs start in "a" and never reach "c" within their length.
const floor: FloorGraph = {
  format: 'underfoot-floor/1',
  name: 'corridor',
  surfaces: ['oak', 'tile'],
  cells: [
    { id: 'a', surface: 'oak', x: 0, y: 0, level: 0, start: true },
    { id: 'b', surface: 'tile', x: 1, y: 0, level: 0, start: false },
    { id: 'c', surface: 'oak', x: 2, y: 0, level: 0, start: false },
  ],
  links: [
    { from: 'a', to: 'b', oneway: false },
    { from: 'b', to: 'c', oneway: true },
    { from: 'c', to: 'a', oneway: true },
  ],
};
const prior = surveyPrior(Int32Array.from([0, 1, 0]), 2, 0.8);

describe('numerical faults', () => {
  it('a cell never visited keeps its prior row (prior strength > 0) or its previous row (0), never NaN', () => {
    const model = buildModel(floor, { hit: 0.8 });
    const runs = [{ id: 'short', obs: Int32Array.from([0]) }]; // one step, in "a" only
    const withPrior = emIteration(model, runs, { mode: 'learned', priorStrength: 10, prior }).model;
    expect(Array.from(withPrior.emission.subarray(4, 6))).toEqual(Array.from(prior.subarray(4, 6)));
    const plain = emIteration(model, runs, { mode: 'learned', priorStrength: 0 }).model;
    expect(Array.from(plain.emission.subarray(4, 6))).toEqual(Array.from(model.emission.subarray(4, 6)));
    for (const v of [...plain.emission, ...plain.trans, ...plain.start]) expect(Number.isFinite(v)).toBe(true);
  });

  it('a run impossible under the model is named, with the step where it became impossible', () => {
    const model = buildModel(floor, { hit: 0.8 });
    model.emission.set([1, 0, 0, 1, 1, 0]); // cells read only their own surface
    // a (oak) → b (tile) is possible; then "tile" twice more is possible (dwell in b); "oak" at step 3 needs c: possible;
    // but starting with "tile" is impossible: the only start cell reads oak.
    const run = { id: 'robot-7/2026-11-30', obs: Int32Array.from([1, 1, 0]) };
    let caught: unknown;
    try {
      emIteration(model, [run], { mode: 'tied', priorStrength: 0 });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(WorkError);
    expect((caught as Error).message).toContain('"robot-7/2026-11-30"');
    expect((caught as Error).message).toContain('step index 0');
    expect((caught as Error).message).toContain('"tile"');
  });
});
