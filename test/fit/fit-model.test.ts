import { describe, it, expect } from 'vitest';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../../src/fit/fit-model.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';

const floor = gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x * 7 + y * 3) % 3);

function simulated(nRuns: number, nSteps: number, seed: number) {
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  return Array.from({ length: nRuns }, (_, r) => ({ id: `run-${r}`, obs: sampleRun(truth, nSteps, rng, 0.05).obs }));
}

const input = { floor, runs: simulated(12, 150, 3), floorDigest: 'x', runsDigests: [] };
const options = { ...DEFAULT_FIT_OPTIONS, restarts: 3, maxIter: 30 };

describe('fitModel', () => {
  it('fitModel(input, options, 1) records every restart, a held-out split and a selected restart', async () => {
    const { record } = await fitModel(input, options, 1);
    expect(record.restarts).toHaveLength(3);
    expect(record.split.heldOut.length).toBe(Math.round(0.2 * 12));
    expect(record.split.fit.length + record.split.heldOut.length).toBe(12);
    for (const r of record.restarts) {
      expect(r.heldOutLogLikPerReading).not.toBeNull();
      for (let i = 1; i < r.history.length; i++) expect(r.history[i]).toBeGreaterThanOrEqual(r.history[i - 1] - 1e-9 * Math.abs(r.history[i - 1]));
    }
    const best = Math.max(...record.restarts.map((r) => r.heldOutLogLikPerReading!));
    expect(record.restarts[record.selected].heldOutLogLikPerReading).toBe(best);
    expect(record.finalPass).not.toBeNull();
  });

  it('fitModel gives bit-identical parameters with 1 and 2 workers', async () => {
    const a = await fitModel(input, options, 1);
    const b = await fitModel(input, options, 2);
    expect(Buffer.from(b.model.emission.buffer).equals(Buffer.from(a.model.emission.buffer))).toBe(true);
    expect(Buffer.from(b.model.trans.buffer).equals(Buffer.from(a.model.trans.buffer))).toBe(true);
    expect(b.record).toEqual(a.record);
  });
});
