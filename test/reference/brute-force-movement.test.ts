import { describe, it, expect } from 'vitest';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardMoveSegment } from '../../src/kernels/forward-move-segment.js';
import { decodeMoveRun } from '../../src/decode/decode-move-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { addMoveRunCounts } from '../../src/fit/add-move-run-counts.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { expectClose } from '../helpers/close.js';
import { enumerateMovePaths, pathProbability, randomMoveModel, randomMoveSteps } from '../helpers/movement-oracle.js';

const TOL = { abs: 1e-12, rel: 1e-12 };

describe('movement kernels against brute-force enumeration of all paths (per-step transitions)', () => {
  // Invented random models (≤ 5 cells on two levels, ≤ 7 steps, dropouts, unknown odometry).
  const rng = new SeededRandom(20261203);
  for (let trial = 0; trial < 40; trial++) {
    const nCells = 1 + rng.int(5);
    const nReadings = 2 + rng.int(3);
    const T = 1 + rng.int(7);
    const seed = rng.nextUint32();
    const obs = Array.from({ length: T }, () => (rng.next() < 0.15 ? -1 : rng.int(nReadings)));
    const { dBin, hBin } = randomMoveSteps(rng, T);
    it(`log-likelihood, posteriors, Viterbi path and E-step counts equal enumeration (trial ${trial}: ${nCells} cells, ${T} steps)`, () => {
      const model = randomMoveModel(seed, nCells, nReadings);
      const chain = chainFromModel(model);
      const steps = { dBin: Int32Array.from(dBin), hBin: Int32Array.from(hBin) };
      const ref = enumerateMovePaths(model, obs, dBin, hBin);
      const o = Int32Array.from(obs);
      const logP = forwardMoveSegment(chain, chain.move!, o, steps, 0, T, new Float64Array((T + 1) * nCells), new Float64Array(T), 0, new Float64Array(2 * nCells));
      expectClose(logP, Math.log(ref.total), TOL, 'log P');
      const dec = decodeMoveRun(chain, logChain(chain), o, steps);
      expectClose(dec.logLik, Math.log(ref.total), TOL, 'decode log P');
      expectClose(dec.pathLogProb, Math.log(ref.best), TOL, 'Viterbi log-probability');
      expectClose(pathProbability(model, obs, dBin, hBin, Array.from(dec.path)), ref.best, { rel: 1e-12 }, 'decoded path probability');
      if (ref.best - ref.second > 1e-9 * ref.best) expect(Array.from(dec.path)).toEqual(ref.bestPath);
      for (let t = 0; t < T; t++) {
        expectClose(dec.pathP[t], ref.gamma[t][dec.path[t]], TOL, `path posterior at ${t}`);
        expectClose(dec.likelyP[t], Math.max(...ref.gamma[t]), TOL, `best posterior at ${t}`);
      }
      // E-step counts: plain counts at steps with unknown distance, movement counts by bin.
      const nLinks = chain.outPtr[nCells];
      const counts = emptyCounts(nCells, chain.nnz, nReadings, nLinks);
      const ll = addMoveRunCounts(chain, o, steps, counts, counts.move!, new EStepWorkspace());
      expectClose(ll, Math.log(ref.total), TOL, 'E-step log P');
      const s = model.structure;
      const eligible = (i: number): boolean => chain.dwell[i] > 0 && chain.dwell[i] < 1;
      const expTrans = new Float64Array(s.nnz);
      const stay = new Map<number, number>();
      const go = new Map<number, number>();
      const byHeading = new Map<string, number>();
      for (let t = 1; t < T; t++) {
        for (let i = 0; i < nCells; i++) {
          for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
            const j = s.succIdx[k];
            const x = ref.xi[t][i][j];
            if (dBin[t] < 0) expTrans[k] += x;
            else if (eligible(i)) (j === i ? stay : go).set(dBin[t], ((j === i ? stay : go).get(dBin[t]) ?? 0) + x);
            if (hBin[t] >= 0 && j !== i) byHeading.set(`${hBin[t]}:${i}:${j}`, (byHeading.get(`${hBin[t]}:${i}:${j}`) ?? 0) + x);
          }
        }
      }
      for (let k = 0; k < s.nnz; k++) expectClose(counts.trans[k], expTrans[k], TOL, `plain transition count ${k}`);
      for (let b = 0; b < 150; b++) {
        expectClose(counts.move!.stayByDistance[b], stay.get(b) ?? 0, TOL, `stays at distance bin ${b}`);
        expectClose(counts.move!.moveByDistance[b], go.get(b) ?? 0, TOL, `moves at distance bin ${b}`);
      }
      for (let hb = 0; hb < 72; hb++) {
        for (let i = 0; i < nCells; i++) {
          for (let q = chain.outPtr[i]; q < chain.outPtr[i + 1]; q++) {
            expectClose(counts.move!.linkByHeading[hb * nLinks + q], byHeading.get(`${hb}:${i}:${chain.outIdx[q]}`) ?? 0, TOL, `link count ${hb}/${q}`);
          }
        }
      }
      for (let i = 0; i < nCells; i++) {
        let g = 0;
        for (let t = 0; t < T; t++) if (obs[t] === 0) g += ref.gamma[t][i];
        expectClose(counts.emitT[i], g, TOL, `reading-0 count of cell ${i}`);
      }
    });
  }
});
