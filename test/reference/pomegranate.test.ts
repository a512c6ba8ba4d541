import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { buildStructure } from '../../src/model/build-structure.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { posteriorMarginals } from '../../src/kernels/posterior-marginals.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import { emIteration } from '../../src/fit/em-iteration.js';
import { expectClose } from '../helpers/close.js';

// Source: fixtures written by test/reference/make-pomegranate-fixtures.py with Debian's
// python3-pomegranate (a general-purpose HMM library; version recorded in the fixture), itself
// cross-checked there against an independent numpy implementation.
interface Edge {
  from: number;
  to: number;
  p: number;
}
interface Params {
  start: number[];
  transitions: Edge[];
  emission: number[][];
}
interface Case extends Params {
  name: string;
  nCells: number;
  nReadings: number;
  runs: number[][];
  logProb: number[];
  totalLogProbBefore: number;
  posterior: number[][][];
  viterbi: Array<{ logProb: number; path: number[] }>;
  afterOneStep: Params;
}
const fixture = JSON.parse(
  readFileSync(fileURLToPath(new URL('./fixtures/pomegranate-hmm.json', import.meta.url)), 'utf8'),
) as { pomegranateVersion: string; cases: Case[] };

function modelOf(c: Case): HmmModel {
  const structure = buildStructure(
    c.nCells,
    c.transitions.filter((e) => e.from !== e.to).map((e) => [e.from, e.to] as [number, number]),
  );
  const trans = new Float64Array(structure.nnz);
  for (const e of c.transitions) trans[positionOf(structure.succPtr, structure.succIdx, e.from, e.to)] = e.p;
  const surfaces = Array.from({ length: c.nReadings }, (_, r) => `r${r}`);
  return {
    surfaces,
    cells: Array.from({ length: c.nCells }, (_, i) => ({ id: `c${i}`, surface: 'r0', x: 0, y: 0, level: 0 })),
    structure,
    start: Float64Array.from(c.start),
    trans,
    emission: Float64Array.from(c.emission.flat()),
  };
}

function positionOf(ptr: Int32Array, idx: Int32Array, i: number, j: number): number {
  for (let k = ptr[i]; k < ptr[i + 1]; k++) if (idx[k] === j) return k;
  throw new Error(`no nonzero ${i} → ${j}`);
}

describe(`engine against pomegranate ${fixture.pomegranateVersion} fixtures`, () => {
  it('has the fixture cases', () => {
    expect(fixture.cases.length).toBeGreaterThanOrEqual(6);
  });
  for (const c of fixture.cases) {
    describe(`${c.name} (${c.nCells} cells, ${c.nReadings} readings, ${c.runs.length} runs)`, () => {
      const model = modelOf(c);
      const chain = chainFromModel(model);

      it('forwardScaled log P per run matches (≤ 1e-9 relative)', () => {
        c.runs.forEach((run, r) => {
          const obs = Int32Array.from(run);
          const logP = forwardScaled(chain, obs, obs.length, new Float64Array(c.nCells * obs.length), new Float64Array(obs.length));
          expectClose(logP, c.logProb[r], { rel: 1e-9 }, `run ${r}`);
        });
      });

      it('posterior marginals match (≤ 1e-9 absolute)', () => {
        c.runs.forEach((run, r) => {
          const obs = Int32Array.from(run);
          const T = obs.length;
          const n = c.nCells;
          const alpha = new Float64Array(n * T);
          const scale = new Float64Array(T);
          const beta = new Float64Array(n * T);
          const gamma = new Float64Array(n * T);
          forwardScaled(chain, obs, T, alpha, scale);
          backwardScaled(chain, obs, T, scale, beta);
          posteriorMarginals(n, T, alpha, beta, gamma);
          let worst = 0;
          for (let t = 0; t < T; t++) for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(gamma[t * n + i] - c.posterior[r][t][i]));
          expect(worst, `run ${r} worst posterior difference`).toBeLessThanOrEqual(1e-9);
        });
      });

      it('Viterbi path and its log-probability match', () => {
        const log = logChain(chain);
        c.runs.forEach((run, r) => {
          const dec = decodeRun(chain, log, Int32Array.from(run));
          expectClose(dec.pathLogProb, c.viterbi[r].logProb, { rel: 1e-9 }, `run ${r} path log P`);
          expect(Array.from(dec.path), `run ${r} path`).toEqual(c.viterbi[r].path);
        });
      });

      it('one Baum-Welch iteration (learned transitions, no prior) matches (≤ 1e-9 absolute)', () => {
        const runs = c.runs.map((run, r) => ({ id: `run${r}`, obs: Int32Array.from(run) }));
        const res = emIteration(model, runs, { mode: 'learned', priorStrength: 0 });
        expectClose(res.logLik, c.totalLogProbBefore, { rel: 1e-9 }, 'total log P');
        const after = res.model;
        const s = after.structure;
        c.afterOneStep.transitions.forEach((e) => {
          expectClose(after.trans[positionOf(s.succPtr, s.succIdx, e.from, e.to)], e.p, { abs: 1e-9 }, `a[${e.from}→${e.to}]`);
        });
        c.afterOneStep.emission.forEach((row, i) =>
          row.forEach((p, k) => expectClose(after.emission[i * c.nReadings + k], p, { abs: 1e-9 }, `b[${i}][${k}]`)),
        );
        c.afterOneStep.start.forEach((p, i) => expectClose(after.start[i], p, { abs: 1e-9 }, `start[${i}]`));
        // Nothing outside the fixture's edges exists in the re-estimated model.
        expect(s.nnz).toBe(c.transitions.length);
      });
    });
  }
});
