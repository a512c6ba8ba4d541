import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { runSquarem } from '../../src/fit/squarem-loop.js';
import { runEm } from '../../src/fit/em-loop.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';

// Invented 5 × 4 floor, runs drawn from its nominal model; the fit starts from a flatter survey prior.
const floor = gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x + y) % 3, 'squarem test floor');
const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
const rng = new SeededRandom(5);
const runs = Array.from({ length: 16 }, (_, k) => ({ id: `r${k}`, obs: sampleRun(truth, 200, rng, 0.02).obs }));
const blocks = [[0, 1, 2, 3, 4, 5, 6, 7], [8, 9, 10, 11, 12, 13, 14, 15]];

describe('runSquarem (accelerated EM)', () => {
  for (const mode of ['fixed', 'tied', 'learned'] as const) {
    (mode === 'tied' ? it : itSlow)(`${mode}: reaches plain EM's fixed point in fewer EM steps, never decreasing the objective`, async () => {
      const start = buildModel(floor, { dwell: 0.5, hit: 0.6 });
      const prior = start.emission.slice();
      const packed = packRuns(runs);
      const engine = new LocalEngine(packed, { mode });
      const loop = { mode, priorStrength: 2, prior, maxIter: 5000, tol: 1e-12 };
      const plain = await runEm(engine, packed, start, blocks, loop);
      const fast = await runSquarem(engine, packed, start, blocks, loop);
      expect(plain.stopReason).toBe('converged');
      expect(fast.stopReason).toBe('converged');
      const a = fast.history[fast.history.length - 1];
      const b = plain.history[plain.history.length - 1];
      // Never a worse end point; with few parameters (fixed, tied) the same one. With every link learned
      // (transitions then follow plain EM) another, not worse, optimum is allowed.
      expect(a).toBeGreaterThanOrEqual(b - 1e-8 * Math.abs(b));
      if (mode !== 'learned') expectClose(a, b, { rel: 1e-8 });
      expect(fast.iterations).toBeLessThan(plain.iterations);
      for (let k = 1; k < fast.history.length; k++) expect(fast.history[k]).toBeGreaterThanOrEqual(fast.history[k - 1] - 1e-12);
      // Rows stay probability rows; absent links stay absent.
      for (let i = 0; i < fast.model.emission.length; i += 3) expectClose(fast.model.emission[i] + fast.model.emission[i + 1] + fast.model.emission[i + 2], 1, { abs: 1e-12 });
      expect(Array.from(fast.model.trans).every((p) => p > 0 && p <= 1)).toBe(true);
    });
  }
});
