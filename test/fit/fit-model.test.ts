import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../../src/fit/fit-model.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { reduceBlocks } from '../../src/fit/reduce-blocks.js';
import type { HmmModel } from '../../src/model/hmm-model.js';

const floor = gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x * 7 + y * 3) % 3);

function simulated(nRuns: number, nSteps: number, seed: number) {
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  return Array.from({ length: nRuns }, (_, r) => ({ id: `run-${r}`, obs: sampleRun(truth, nSteps, rng, 0.05).obs }));
}

const input = { floor, runs: simulated(12, 150, 3), floorDigest: 'x', runsDigests: [] };
const options = { ...DEFAULT_FIT_OPTIONS, transitions: 'tied' as const, restarts: 3, maxIter: 30 };

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

  itSlow('fitModel gives bit-identical parameters with 1 and 2 workers', async () => {
    const a = await fitModel(input, options, 1);
    const b = await fitModel(input, options, 2);
    expect(Buffer.from(b.model.emission.buffer).equals(Buffer.from(a.model.emission.buffer))).toBe(true);
    expect(Buffer.from(b.model.trans.buffer).equals(Buffer.from(a.model.trans.buffer))).toBe(true);
    expect(b.record).toEqual(a.record);
  });

  // Oracle for `cellReadings`: one more E-step of the returned model over all runs, blocks of
  // `blockSize` in run order, reduced in block order (what fitModel computed before it reused the final
  // pass's last E-step).
  async function readingsOf(model: HmmModel, blockSize: number): Promise<number[][]> {
    const packed = packRuns(input.runs);
    const all = input.runs.map((_, r) => r);
    const blocks = Array.from({ length: Math.ceil(all.length / blockSize) }, (_, b) => all.slice(b * blockSize, (b + 1) * blockSize));
    const counts = reduceBlocks(model, packed, await new LocalEngine(packed, { mode: 'tied' }).counts(model, blocks));
    const n = model.cells.length;
    return model.cells.map((_, i) => model.surfaces.map((_, r) => counts.emitT[r * n + i]));
  }

  for (const finalPass of [true, false]) {
    it(`records cellReadings equal, bit for bit, to an E-step of the returned model over all runs (final pass ${finalPass ? 'on' : 'off'})`, async () => {
      const o = { ...options, restarts: 2, maxIter: 6, finalPass, blockSize: 5 };
      const { model, record } = await fitModel(input, o, 1);
      expect(record.finalPass === null).toBe(!finalPass);
      expect(record.cellReadings).toEqual(await readingsOf(model, 5));
    });
  }
});


describe('fitModel with --prune', () => {
  itSlow('records prune, ends within 1e-3 of the exact fit per emission entry, and is byte-identical for 1 and 2 threads', async () => {
    const pruned = { ...options, restarts: 1, maxIter: 10, prune: 1e-6 };
    const exact = await fitModel(input, { ...pruned, prune: undefined }, 1);
    const a = await fitModel(input, pruned, 1);
    const b = await fitModel(input, pruned, 2);
    expect(a.record.options.prune).toBe(1e-6);
    expect('prune' in exact.record.options && exact.record.options.prune !== undefined).toBe(false);
    expect(Buffer.from(a.model.emission.buffer).equals(Buffer.from(b.model.emission.buffer))).toBe(true);
    let worst = 0;
    for (let x = 0; x < a.model.emission.length; x++) worst = Math.max(worst, Math.abs(a.model.emission[x] - exact.model.emission[x]));
    expect(worst).toBeLessThan(1e-3);
  });
});
