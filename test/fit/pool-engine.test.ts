import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { randomModel } from '../helpers/random-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { PoolEngine } from '../../src/fit/pool-engine.js';

// Oracle: `LocalEngine` (every block in this thread, checked against the one-run kernels in
// accumulate-block.test.ts). Model and runs are invented (seeded random).

const model = randomModel(31, { nCells: 10, nReadings: 3, linksPerCell: 2 });
const rng = new SeededRandom(5);
const runs = Array.from({ length: 30 }, (_, r) => ({ id: `r${r}`, obs: sampleRun(model, 40 + ((r * 7) % 50), rng, 0.05).obs }));
const shared = packRuns(runs, true);
const blocksOf = (size: number): number[][] => Array.from({ length: Math.ceil(runs.length / size) }, (_, b) => runs.slice(b * size, (b + 1) * size).map((_, k) => b * size + k));

describe('PoolEngine(packed, threads)', () => {
  itSlow('with 3 threads (this one and 2 workers) returns every block byte for byte as in-process, in block order', async () => {
    const blocks = blocksOf(3);
    const local = new LocalEngine(shared, { mode: 'learned' });
    const pool = new PoolEngine(shared, 3, { mode: 'learned' });
    try {
      const want = await local.counts(model, blocks);
      for (let pass = 0; pass < 2; pass++) {
        const got = await pool.counts(model, blocks);
        expect(got.length).toBe(want.length);
        got.forEach((b, k) => {
          expect(b.counts.logLik, `block ${k}`).toBe(want[k].counts.logLik);
          expect(b.counts.nRuns, `block ${k}`).toBe(want[k].counts.nRuns);
          expect(Buffer.from(b.counts.trans.buffer).equals(Buffer.from(want[k].counts.trans.buffer)), `block ${k} trans`).toBe(true);
          expect(Buffer.from(b.counts.emitT.buffer).equals(Buffer.from(want[k].counts.emitT.buffer)), `block ${k} emit`).toBe(true);
        });
      }
      expect((await pool.score(model, blocks)).map((s) => s.logLik)).toEqual((await local.score(model, blocks)).map((s) => s.logLik));
    } finally {
      await pool.close();
    }
  });

  itSlow('with --prune: 2 threads return every block byte for byte as in-process; the counts differ from the exact ones by little', async () => {
    const blocks = blocksOf(4);
    const local = new LocalEngine(shared, { mode: 'tied', prune: 1e-3 });
    const pool = new PoolEngine(shared, 2, { mode: 'tied', prune: 1e-3 });
    const exact = new LocalEngine(shared, { mode: 'tied' });
    try {
      const want = await local.counts(model, blocks);
      const got = await pool.counts(model, blocks);
      const ref = await exact.counts(model, blocks);
      got.forEach((b, k) => {
        expect(b.counts.logLik, `block ${k}`).toBe(want[k].counts.logLik);
        expect(Buffer.from(b.counts.trans.buffer).equals(Buffer.from(want[k].counts.trans.buffer)), `block ${k} trans`).toBe(true);
        expect(Buffer.from(b.counts.emitT.buffer).equals(Buffer.from(want[k].counts.emitT.buffer)), `block ${k} emit`).toBe(true);
        // The pruned filter's log-likelihood is within its bound of the exact one (B ≤ −steps · log(1 − eps)).
        const steps = blocks[k].reduce((n, r) => n + runs[r].obs.length, 0);
        expect(Math.abs(b.counts.logLik - ref[k].counts.logLik), `block ${k} log P`).toBeLessThanOrEqual(-steps * Math.log1p(-1e-3));
      });
    } finally {
      await pool.close();
    }
  });

  itSlow('works with fewer blocks than threads, and with none', async () => {
    const pool = new PoolEngine(shared, 4, { mode: 'tied' });
    const local = new LocalEngine(shared, { mode: 'tied' });
    try {
      const one = [[0, 1, 2]];
      expect((await pool.counts(model, one))[0].counts.logLik).toBe((await local.counts(model, one))[0].counts.logLik);
      expect(await pool.counts(model, [])).toEqual([]);
    } finally {
      await pool.close();
    }
  });

  it('refuses work once closed', async () => {
    const pool = new PoolEngine(shared, 2);
    await pool.close();
    await expect(pool.counts(model, [[0]])).rejects.toThrow(/closed/);
  });
});
