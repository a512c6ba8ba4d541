import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { LANES, type SparseChain } from '../../src/kernels/sparse-chain.js';
import { fillLaneGroup } from '../../src/kernels/fill-lane-group.js';
import { forwardLanes } from '../../src/kernels/forward-lanes.js';
import { forwardSegment } from '../../src/kernels/forward-segment.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { expectedCounts } from '../../src/kernels/expected-counts.js';
import { backwardCountsLanes } from '../../src/kernels/backward-counts-lanes.js';
import { backwardTotalsLanes } from '../../src/kernels/backward-totals-lanes.js';
import { backwardCountsSegment } from '../../src/kernels/backward-counts-segment.js';

// Oracle: the plain one-run kernels `forwardScaled` and `expectedCounts` (Rabiner 1989, "A tutorial on
// hidden Markov models…", Proc. IEEE 77(2), eqs. 19–20, 37–40 with the scaling of section V.A), which the
// pomegranate fixtures and brute-force enumeration check in test/reference. Runs are sampled from
// invented random models; lengths differ so that the lanes are ragged.

const LENGTHS = [57, 40, 57, 13, 29, 57, 44, 56];

function runsOf(model: HmmModel, seed: number, lengths: number[]): Int32Array[] {
  const rng = new SeededRandom(seed);
  return lengths.map((T) => sampleRun(model, T, rng, 0.1).obs);
}

/** Per-run reference: log P and expected counts by the plain kernels, per CSR nonzero. */
function reference(chain: SparseChain, runs: Int32Array[]) {
  const n = chain.nCells;
  const m = chain.nReadings;
  const start = new Float64Array(n);
  const trans = new Float64Array(chain.nnz);
  const emit = new Float64Array(m * n);
  const logs = runs.map((obs) => {
    const T = obs.length;
    const alpha = new Float64Array(n * T);
    const scale = new Float64Array(T);
    const logP = forwardScaled(chain, obs, T, alpha, scale);
    expectedCounts(chain, obs, T, alpha, scale, new Float64Array(3 * n), start, trans, emit);
    return logP;
  });
  return { logs, start, trans, emit };
}

/** Runs the lane kernels over a group in segments of `segment` steps, checkpointing as the E-step does. */
function laneCounts(chain: SparseChain, runs: Int32Array[], segment: number, backward: 'links' | 'totals') {
  const n = chain.nCells;
  const m = chain.nReadings;
  const row = LANES * n;
  const group = fillLaneGroup(runs, n, m);
  const T = group.nSteps;
  const nSeg = Math.ceil(T / segment);
  const table = new Float64Array((segment + 1) * row);
  const scale = new Float64Array(T * LANES);
  const checkpoints = new Float64Array(nSeg * row);
  const logs = new Float64Array(LANES);
  const forward = (a: number, b: number, out: Float64Array): void => forwardLanes(chain, group, a, b, table, scale, out);
  for (let g = 0; g < nSeg; g++) {
    if (g > 0) {
      table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(table.subarray(0, row), g * row);
    }
    forward(g * segment, Math.min(T, (g + 1) * segment), logs);
  }
  const w = new Float64Array(row);
  const wSpare = new Float64Array(row);
  const emit = new Float64Array((m + 1) * n);
  const links = new Float64Array(chain.outPtr[n]);
  const dwell = new Float64Array(n);
  const lastGamma = new Float64Array(n);
  const start = new Float64Array(n);
  for (let g = nSeg - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSeg - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      forward(a, b, new Float64Array(LANES));
    }
    if (backward === 'links') backwardCountsLanes(chain, group, a, b, table, scale, w, wSpare, emit, links, dwell, start);
    else backwardTotalsLanes(chain, group, a, b, table, scale, w, wSpare, emit, dwell, lastGamma, start);
  }
  return { logs, emit, links, dwell, lastGamma, start };
}

describe('lane kernels', () => {
  const model = randomModel(41, { nCells: 9, nReadings: 4, linksPerCell: 3 });
  const chain = chainFromModel(model);
  const runs = runsOf(model, 7, LENGTHS);

  it('forwardLanes gives each lane exactly the log P of forwardSegment on its run alone, whatever the other lanes hold', () => {
    const n = chain.nCells;
    const group = fillLaneGroup(runs, n, chain.nReadings);
    const logs = new Float64Array(LANES);
    forwardLanes(chain, group, 0, group.nSteps, new Float64Array((group.nSteps + 1) * LANES * n), new Float64Array(group.nSteps * LANES), logs);
    runs.forEach((obs, k) => {
      const alone = forwardSegment(chain, obs, 0, obs.length, new Float64Array((obs.length + 1) * n), new Float64Array(obs.length), 0);
      expect(logs[k], `lane ${k}`).toBe(alone);
    });
  });

  it('forwardLanes log P matches the plain forwardScaled (≤ 1e-12 relative)', () => {
    const ref = reference(chain, runs);
    const { logs } = laneCounts(chain, runs, 1000, 'links');
    ref.logs.forEach((l, k) => expectClose(logs[k], l, { rel: 1e-12 }, `lane ${k}`));
  });

  it('a group of fewer runs than lanes leaves the unused lanes out of every sum', () => {
    const three = runs.slice(0, 3);
    const ref = reference(chain, three);
    const got = laneCounts(chain, three, 1000, 'links');
    expect(Array.from(got.logs.subarray(3))).toEqual(new Array(LANES - 3).fill(0));
    ref.start.forEach((v, i) => expectClose(got.start[i], v, { abs: 1e-12, rel: 1e-12 }, `start ${i}`));
    for (let x = 0; x < ref.emit.length; x++) expectClose(got.emit[x], ref.emit[x], { abs: 1e-12, rel: 1e-12 }, `emit ${x}`);
  });

  it('backwardCountsLanes gives the plain expectedCounts: per link, dwell, readings and start (≤ 1e-12)', () => {
    const ref = reference(chain, runs);
    const got = laneCounts(chain, runs, 1000, 'links');
    const tol = { abs: 1e-12, rel: 1e-12 };
    for (let q = 0; q < chain.outPtr[chain.nCells]; q++) expectClose(got.links[q], ref.trans[chain.outPos[q]], tol, `link ${q}`);
    for (let i = 0; i < chain.nCells; i++) {
      expectClose(got.dwell[i], ref.trans[chain.dwellPos[i]], tol, `dwell ${i}`);
      expectClose(got.start[i], ref.start[i], tol, `start ${i}`);
    }
    for (let x = 0; x < ref.emit.length; x++) expectClose(got.emit[x], ref.emit[x], tol, `emit ${x}`);
  });

  it('checkpointed lane segments (3 steps) give the same numbers, bit for bit, as one segment', () => {
    const plain = laneCounts(chain, runs, 1000, 'links');
    const check = laneCounts(chain, runs, 3, 'links');
    expect(Array.from(check.logs)).toEqual(Array.from(plain.logs));
    expect(Array.from(check.links)).toEqual(Array.from(plain.links));
    expect(Array.from(check.emit)).toEqual(Array.from(plain.emit));
    expect(Array.from(check.dwell)).toEqual(Array.from(plain.dwell));
  });

  it('backwardTotalsLanes: dwell, readings and start as backwardCountsLanes; γ total less last steps equals dwell + links', () => {
    const links = laneCounts(chain, runs, 1000, 'links');
    const totals = laneCounts(chain, runs, 1000, 'totals');
    expect(Array.from(totals.dwell)).toEqual(Array.from(links.dwell));
    expect(Array.from(totals.emit)).toEqual(Array.from(links.emit));
    expect(Array.from(totals.start)).toEqual(Array.from(links.start));
    const n = chain.nCells;
    for (let i = 0; i < n; i++) {
      let gamma = 0;
      for (let r = 0; r <= chain.nReadings; r++) gamma += totals.emit[r * n + i];
      let rowLinks = 0;
      for (let q = chain.outPtr[i]; q < chain.outPtr[i + 1]; q++) rowLinks += links.links[q];
      expectClose(gamma - totals.lastGamma[i], links.dwell[i] + rowLinks, { abs: 1e-12, rel: 1e-12 }, `cell ${i}`);
    }
  });

  it('backwardCountsSegment (one run) gives the plain expectedCounts (≤ 1e-12)', () => {
    const obs = runs[0];
    const n = chain.nCells;
    const T = obs.length;
    const ref = reference(chain, [obs]);
    const table = new Float64Array((T + 1) * n);
    const scale = new Float64Array(T);
    forwardSegment(chain, obs, 0, T, table, scale, 0);
    const emit = new Float64Array((chain.nReadings + 1) * n);
    const links = new Float64Array(chain.outPtr[n]);
    const dwell = new Float64Array(n);
    const start = new Float64Array(n);
    backwardCountsSegment(chain, obs, 0, T, table, scale, new Float64Array(n), new Float64Array(n), emit, links, dwell, start);
    const tol = { abs: 1e-12, rel: 1e-12 };
    for (let q = 0; q < links.length; q++) expectClose(links[q], ref.trans[chain.outPos[q]], tol, `link ${q}`);
    for (let i = 0; i < n; i++) expectClose(dwell[i], ref.trans[chain.dwellPos[i]], tol, `dwell ${i}`);
    for (let x = 0; x < ref.emit.length; x++) expectClose(emit[x], ref.emit[x], tol, `emit ${x}`);
  });

  it('forwardLanes reports −Infinity for a lane whose readings are impossible and leaves the others intact', () => {
    const n = 3;
    // Only cell 0 can start, and it never shows reading 1: a run that begins with reading 1 is impossible.
    const m = randomModel(3, { nCells: n, nReadings: 2 });
    const emission = Float64Array.from([1, 0, 1, 0, 0, 1]);
    const start = Float64Array.from([1, 0, 0]);
    const c = chainFromModel({ ...m, emission, start });
    const bad = Int32Array.from([1, 0, 0]);
    const good = Int32Array.from([0, 0, -1]);
    const group = fillLaneGroup([good, bad], n, 2);
    const logs = new Float64Array(LANES);
    forwardLanes(c, group, 0, 3, new Float64Array(4 * LANES * n), new Float64Array(3 * LANES), logs);
    expect(logs[1]).toBe(-Infinity);
    expect(logs[0]).toBe(forwardSegment(c, good, 0, 3, new Float64Array(4 * n), new Float64Array(3), 0));
    expect(Number.isFinite(logs[0])).toBe(true);
  });
});
