import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { emptyCounts, type ExpectedCountsTable } from '../../src/model/expected-counts-table.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';
import { maximizeModel } from '../../src/model/maximize-model.js';
import { surveyPrior } from '../../src/model/survey-prior.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { accumulateRun } from '../../src/fit/accumulate-run.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { laneGroups } from '../../src/fit/lane-groups.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { PoolEngine } from '../../src/fit/pool-engine.js';

// Oracle: `accumulateRun`, one run at a time through the one-run kernels (themselves checked against
// the plain Rabiner 1989 kernels in test/kernels and against pomegranate in test/reference), and
// `maximizeModel` fed with per-link counts. Models and runs are invented (seeded random).

const model = randomModel(5, { nCells: 12, nReadings: 4, linksPerCell: 3 });
const chain = chainFromModel(model);
// Ragged lengths: a lane group of several lengths, groups of three and two, runs alone, and an empty run.
const LENGTHS = [120, 118, 90, 119, 300, 61, 117, 0, 64, 33, 112, 80, 30, 31, 20];
const rng = new SeededRandom(11);
const runs = LENGTHS.map((T, r) => ({ id: `r${r}`, obs: sampleRun(model, T, rng, 0.1).obs }));
const packed = packRuns(runs);
const block = runs.map((_, r) => r);
const TOL = { abs: 1e-12, rel: 1e-12 };

function expectCountsClose(got: ExpectedCountsTable, want: ExpectedCountsTable, label: string): void {
  expectClose(got.logLik, want.logLik, { rel: 1e-12 }, `${label} log-likelihood`);
  expect(got.nReadings).toBe(want.nReadings);
  expect(got.nRuns).toBe(want.nRuns);
  got.start.forEach((v, i) => expectClose(v, want.start[i], TOL, `${label} start ${i}`));
  got.trans.forEach((v, k) => expectClose(v, want.trans[k], TOL, `${label} trans ${k}`));
  got.emitT.forEach((v, x) => expectClose(v, want.emitT[x], TOL, `${label} emit ${x}`));
}

function oneByOne(m: HmmModel): ExpectedCountsTable {
  const c = chainFromModel(m);
  const counts = emptyCounts(c.nCells, c.nnz, c.nReadings);
  const ws = new EStepWorkspace();
  for (const run of runs) accumulateRun(c, run.obs, counts, ws);
  return counts;
}

describe('accumulateBlock', () => {
  it('laneGroups(runs, offsets) puts runs longest first, up to 8, each at least half its group’s first; one alone goes alone', () => {
    const groups = laneGroups(block, packed.offsets);
    // Lengths in order: 300 | 120 119 118 117 112 90 80 64 | 61 33 31 | 30 20 | 0.
    expect(groups).toEqual([[4], [0, 3, 1, 6, 10, 2, 11, 8], [5, 9, 13], [12, 14], [7]]);
  });

  it('accumulateBlock(…, "learned") equals accumulateRun run by run (≤ 1e-12), whatever the lane grouping', () => {
    const got = accumulateBlock(chain, packed, block, new EStepWorkspace(), 'learned');
    expect(got.impossibleRun).toBe(-1);
    expectCountsClose(got.counts, oneByOne(model), 'block');
  });

  it('checkpointed E-step (every run and group in ⌈√T⌉-step segments) gives the plain counts bit for bit', () => {
    const plain = accumulateBlock(chain, packed, block, new EStepWorkspace(), 'learned').counts;
    const ws = new EStepWorkspace();
    ws.plainLimitBytes = 0;
    const checkpointed = accumulateBlock(chain, packed, block, ws, 'learned').counts;
    expect(checkpointed.logLik).toBe(plain.logLik);
    expect(Array.from(checkpointed.trans)).toEqual(Array.from(plain.trans));
    expect(Array.from(checkpointed.emitT)).toEqual(Array.from(plain.emitT));
    expect(Array.from(checkpointed.start)).toEqual(Array.from(plain.start));
  });

  for (const tied of [false, true]) {
    it(`"tied" totals give the tied M-step of per-link counts (≤ 1e-12), ${tied ? 'equal-split' : 'random'} transitions`, () => {
      const m: HmmModel = tied ? { ...model, trans: equalSplitTransitions(model.structure, 0.4) } : model;
      const c = chainFromModel(m);
      const perLink = accumulateBlock(c, packed, block, new EStepWorkspace(), 'learned').counts;
      const totals = accumulateBlock(c, packed, block, new EStepWorkspace(), 'tied').counts;
      expectClose(totals.logLik, perLink.logLik, { rel: 1e-12 }, 'log-likelihood');
      totals.emitT.forEach((v, x) => expectClose(v, perLink.emitT[x], TOL, `emit ${x}`));
      const prior = surveyPrior(Int32Array.from(m.cells, (_, i) => i % 4), 4, 0.8);
      for (const mode of ['tied', 'fixed'] as const) {
        const a = maximizeModel(m, totals, { mode, priorStrength: 3, prior });
        const b = maximizeModel(m, perLink, { mode, priorStrength: 3, prior });
        a.trans.forEach((v, k) => expectClose(v, b.trans[k], TOL, `${mode} trans ${k}`));
        a.emission.forEach((v, x) => expectClose(v, b.emission[x], TOL, `${mode} emission ${x}`));
      }
    });
  }

  it('names the first impossible run in block order', () => {
    // Reading 3 made impossible everywhere; runs 6 and 2 (in that order in the block) show it.
    const emission = model.emission.slice();
    for (let i = 0; i < 12; i++) {
      emission[i * 4 + 3] = 0;
      const rest = emission[i * 4] + emission[i * 4 + 1] + emission[i * 4 + 2];
      for (let r = 0; r < 3; r++) emission[i * 4 + r] /= rest;
    }
    const c = chainFromModel({ ...model, emission });
    const obs = runs.map((r) => Int32Array.from(r.obs, (o) => (o === 3 ? 0 : o)));
    obs[2][10] = 3;
    obs[6][50] = 3;
    const p = packRuns(obs.map((o, r) => ({ id: `r${r}`, obs: o })));
    expect(accumulateBlock(c, p, [0, 1, 6, 3, 2, 10, 11], new EStepWorkspace(), 'learned').impossibleRun).toBe(6);
    expect(accumulateBlock(c, p, [0, 1, 2, 3, 6, 10, 11], new EStepWorkspace(), 'tied').impossibleRun).toBe(2);
  });

  itSlow('PoolEngine with 2 workers returns the in-process block counts byte for byte, in block order', async () => {
    const shared = packRuns(runs, true);
    const blocks = [[0, 1, 2, 3, 4, 5, 6, 7], [8, 9, 10, 11, 12, 13, 14]];
    const tied = { ...model, trans: equalSplitTransitions(model.structure, 0.4) };
    const local = new LocalEngine(shared, { mode: 'tied' });
    const pool = new PoolEngine(shared, 2, { mode: 'tied' });
    try {
      const a = await local.counts(tied, blocks);
      const b = await pool.counts(tied, blocks);
      expect(b.length).toBe(a.length);
      b.forEach((blk, k) => {
        expect(blk.counts.logLik, `block ${k}`).toBe(a[k].counts.logLik);
        expect(Buffer.from(blk.counts.trans.buffer).equals(Buffer.from(a[k].counts.trans.buffer)), `block ${k} trans`).toBe(true);
        expect(Buffer.from(blk.counts.emitT.buffer).equals(Buffer.from(a[k].counts.emitT.buffer)), `block ${k} emit`).toBe(true);
      });
      const sa = await local.score(tied, blocks);
      const sb = await pool.score(tied, blocks);
      expect(sb.map((s) => s.logLik)).toEqual(sa.map((s) => s.logLik));
    } finally {
      await pool.close();
    }
  });
});
