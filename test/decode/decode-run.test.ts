import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { logChain } from '../../src/decode/log-chain.js';
import { decodeRun, type DecodedRun } from '../../src/decode/decode-run.js';
import { viterbiPath } from '../../src/decode/viterbi-path.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { viterbiLog } from '../../src/kernels/viterbi-log.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';

// Oracle: the one-pass reference kernels (forwardScaled, backwardScaled, viterbiLog; Rabiner 1989,
// Proc. IEEE 77(2), eqs. 19–27 and 32–35), checked in test/reference against pomegranate and brute force.
// Models and runs are invented (seeded random).

function expectSameDecoding(got: DecodedRun, want: DecodedRun, label: string): void {
  expect(Array.from(got.path), `${label} path`).toEqual(Array.from(want.path));
  expectClose(got.logLik, want.logLik, { rel: 1e-12 }, `${label} log P`);
  expectClose(got.pathLogProb, want.pathLogProb, { rel: 1e-12 }, `${label} path log P`);
  for (let t = 0; t < want.path.length; t++) {
    expectClose(got.pathP[t], want.pathP[t], { abs: 1e-12 }, `${label} path p ${t}`);
    expectClose(got.likelyP[t], want.likelyP[t], { abs: 1e-12 }, `${label} likely p ${t}`);
    expectClose(got.entropyBits[t], want.entropyBits[t], { abs: 1e-12 }, `${label} entropy ${t}`);
    if (Number.isNaN(want.surpriseBits[t])) expect(got.surpriseBits[t]).toBeNaN();
    else expectClose(got.surpriseBits[t], want.surpriseBits[t], { abs: 1e-12 }, `${label} surprise ${t}`);
  }
}

describe('decodeRun', () => {
  const model = randomModel(77, { nCells: 14, nReadings: 4, linksPerCell: 3, startShare: 0.5 });
  const chain = chainFromModel(model);
  const log = logChain(chain);
  const obs = sampleRun(model, 500, new SeededRandom(9), 0.1).obs;
  const n = chain.nCells;
  const T = obs.length;

  it('decodeRun checkpointed (segments of ⌈√T⌉ steps) agrees with the plain pass: same path, figures within 1e-12', () => {
    const plain = decodeRun(chain, log, obs);
    const checkpointed = decodeRun(chain, log, obs, { plainLimitBytes: 0 });
    expectSameDecoding(checkpointed, plain, 'checkpointed');
  });

  it('decodeRun matches the reference kernels: Viterbi path and log P, path posteriors, surprise', () => {
    const dec = decodeRun(chain, log, obs, { plainLimitBytes: 0 });
    const alpha = new Float64Array(n * T);
    const scale = new Float64Array(T);
    const logP = forwardScaled(chain, obs, T, alpha, scale);
    const beta = new Float64Array(n * T);
    backwardScaled(chain, obs, T, scale, beta);
    const path = new Int32Array(T);
    const pathLogP = viterbiLog(n, chain.nReadings, log.logStart, chain.predPtr, chain.predIdx, log.logPredProb, log.logEmitT, obs, T, new Float64Array(2 * n), new Int32Array(T * n), path);
    expect(Array.from(dec.path)).toEqual(Array.from(path));
    expectClose(dec.pathLogProb, pathLogP, { rel: 1e-12 }, 'path log P');
    expectClose(dec.logLik, logP, { rel: 1e-12 }, 'log P');
    for (let t = 0; t < T; t++) {
      expectClose(dec.pathP[t], alpha[t * n + path[t]] * beta[t * n + path[t]], { abs: 1e-12 }, `path p ${t}`);
      if (obs[t] >= 0) expectClose(dec.surpriseBits[t], -Math.log2(1 / scale[t]), { abs: 1e-12 }, `surprise ${t}`);
    }
  });

  it('viterbiPath with checkpoints (limit 0) gives the one-pass path and log P exactly', () => {
    const plain = new Int32Array(T);
    const checkpointed = new Int32Array(T);
    const a = viterbiPath(chain, log, obs, Infinity, plain);
    const b = viterbiPath(chain, log, obs, 0, checkpointed);
    expect(b).toBe(a);
    expect(Array.from(checkpointed)).toEqual(Array.from(plain));
  });

  it('viterbiPath in WebAssembly gives the JavaScript path and log P bit for bit: 1-, 2-byte pointers, ties, checkpoints', () => {
    const wide = randomModel(3, { nCells: 300, nReadings: 4, linksPerCell: 3 });
    const flat = { ...model, trans: equalSplitTransitions(model.structure, 0.1), emission: new Float64Array(n * 4).fill(0.25) };
    for (const m of [model, wide, flat]) {
      const c = chainFromModel(m);
      const l = logChain(c);
      const o = sampleRun(m, 400, new SeededRandom(2), 0.1).obs;
      for (const limit of [Infinity, 0]) {
        const a = new Int32Array(o.length);
        const b = new Int32Array(o.length);
        const pa = viterbiPath(c, l, o, limit, a, true);
        const pb = viterbiPath(c, l, o, limit, b, false);
        expect(pa, `${c.nCells} cells, limit ${limit}`).toBe(pb);
        expect(Array.from(a)).toEqual(Array.from(b));
      }
    }
  });

  it('an impossible run decodes to path −1 everywhere and −Infinity, checkpointed or not', () => {
    const bad = obs.slice();
    // A reading no cell can show: zero its column in the emission table.
    const emission = model.emission.slice();
    for (let i = 0; i < n; i++) emission[i * 4 + 3] = 0;
    bad[T - 1] = 3;
    const c = chainFromModel({ ...model, emission });
    for (const limit of [Infinity, 0]) {
      const dec = decodeRun(c, logChain(c), bad, { plainLimitBytes: limit });
      expect(dec.logLik).toBe(-Infinity);
      expect(dec.pathLogProb).toBe(-Infinity);
      expect(Array.from(dec.path).every((x) => x === -1)).toBe(true);
    }
  });

  it('an empty run decodes to nothing with log P 0', () => {
    const dec = decodeRun(chain, log, new Int32Array(0));
    expect(dec.logLik).toBe(0);
    expect(dec.path.length).toBe(0);
  });
});
