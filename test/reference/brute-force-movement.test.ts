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
import { accumulateMoveLanes } from '../../src/fit/accumulate-move-lanes.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import type { MoveAccumulators } from '../../src/kernels/backward-move-segment.js';
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
      const counts = emptyCounts(nCells, chain.nnz, nReadings, true);
      const ll = addMoveRunCounts(chain, o, steps, counts, counts.move!, new EStepWorkspace());
      expectClose(ll, Math.log(ref.total), TOL, 'E-step log P');
      const s = model.structure;
      const eligible = (i: number): boolean => chain.dwell[i] > 0 && chain.dwell[i] < 1;
      const expTrans = new Float64Array(s.nnz);
      const stay = new Map<number, number>();
      const go = new Map<number, number>();
      const heading = headingStats(model, nCells);
      for (let t = 1; t < T; t++) {
        for (let i = 0; i < nCells; i++) {
          for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
            const j = s.succIdx[k];
            const x = ref.xi[t][i][j];
            if (dBin[t] < 0) expTrans[k] += x;
            else if (eligible(i)) (j === i ? stay : go).set(dBin[t], ((j === i ? stay : go).get(dBin[t]) ?? 0) + x);
            if (hBin[t] >= 0 && j !== i) heading.add(hBin[t], i, j, x);
          }
        }
      }
      for (let k = 0; k < s.nnz; k++) expectClose(counts.trans[k], expTrans[k], TOL, `plain transition count ${k}`);
      for (let b = 0; b < 150; b++) {
        expectClose(counts.move!.stayByDistance[b], stay.get(b) ?? 0, TOL, `stays at distance bin ${b}`);
        expectClose(counts.move!.moveByDistance[b], go.get(b) ?? 0, TOL, `moves at distance bin ${b}`);
      }
      heading.check(counts.move!);
      for (let i = 0; i < nCells; i++) {
        let g = 0;
        for (let t = 0; t < T; t++) if (obs[t] === 0) g += ref.gamma[t][i];
        expectClose(counts.emitT[i], g, TOL, `reading-0 count of cell ${i}`);
      }
    });
  }
});

describe('movement lane kernels (WebAssembly and JavaScript) against brute-force enumeration, eight runs of different lengths', () => {
  const rng = new SeededRandom(20261204);
  for (let trial = 0; trial < 15; trial++) {
    const nCells = 1 + rng.int(4);
    const nReadings = 2 + rng.int(3);
    const seed = rng.nextUint32();
    const runs = Array.from({ length: 8 }, () => {
      const T = 1 + rng.int(6);
      return { obs: Array.from({ length: T }, () => (rng.next() < 0.15 ? -1 : rng.int(nReadings))), ...randomMoveSteps(rng, T) };
    });
    for (const useWasm of [true, false]) it(`log-likelihoods and totals-form E-step counts equal enumeration, ${useWasm ? 'WebAssembly' : 'JavaScript'} lanes (trial ${trial}: ${nCells} cells, lengths ${runs.map((r) => r.obs.length).join(' ')})`, () => {
      const model = randomMoveModel(seed, nCells, nReadings);
      const chain = chainFromModel(model);
      const packed = packRuns(runs.map((r, k) => ({ id: `r${k}`, obs: Int32Array.from(r.obs), moves: { dBin: Int32Array.from(r.dBin), hBin: Int32Array.from(r.hBin) } })));
      const counts = emptyCounts(nCells, chain.nnz, nReadings, true);
      const logs = new Float64Array(8);
      const ws = new EStepWorkspace();
      ws.useWasm = useWasm;
      expect(accumulateMoveLanes(chain, packed, [0, 1, 2, 3, 4, 5, 6, 7], counts, ws, logs)).toBe(true);
      expect(ws.moveLanes!.wasm !== undefined).toBe(useWasm);
      const s = model.structure;
      const eligible = (i: number): boolean => chain.dwell[i] > 0 && chain.dwell[i] < 1;
      const dwell = new Float64Array(nCells);
      const moved = new Float64Array(nCells);
      const stay = new Float64Array(150);
      const go = new Float64Array(150);
      const heading = headingStats(model, nCells);
      const reading0 = new Float64Array(nCells);
      runs.forEach((r, k) => {
        const ref = enumerateMovePaths(model, r.obs, r.dBin, r.hBin);
        expectClose(logs[k], Math.log(ref.total), TOL, `lane ${k} log P`);
        for (let t = 0; t < r.obs.length; t++) for (let i = 0; i < nCells; i++) if (r.obs[t] === 0) reading0[i] += ref.gamma[t][i];
        for (let t = 1; t < r.obs.length; t++) {
          for (let i = 0; i < nCells; i++) {
            for (let q = chain.outPtr[i]; q < chain.outPtr[i + 1]; q++) if (r.hBin[t] >= 0) heading.add(r.hBin[t], i, chain.outIdx[q], ref.xi[t][i][chain.outIdx[q]]);
            for (let kk = s.succPtr[i]; kk < s.succPtr[i + 1]; kk++) {
              const j = s.succIdx[kk];
              const x = ref.xi[t][i][j];
              if (r.dBin[t] < 0) (j === i ? dwell : moved)[i] += x;
              else if (eligible(i)) (j === i ? stay : go)[r.dBin[t]] += x;
            }
          }
        }
      });
      for (let i = 0; i < nCells; i++) {
        expectClose(counts.trans[s.dwellPos[i]], dwell[i], TOL, `dwell count of cell ${i}`);
        if (chain.outPtr[i + 1] > chain.outPtr[i]) expectClose(counts.trans[chain.outPos[chain.outPtr[i]]], moved[i], TOL, `move total of cell ${i}`);
        expectClose(counts.emitT[i], reading0[i], TOL, `reading-0 count of cell ${i}`);
      }
      for (let b = 0; b < 150; b++) {
        expectClose(counts.move!.stayByDistance[b], stay[b], TOL, `stays at ${b}`);
        expectClose(counts.move!.moveByDistance[b], go[b], TOL, `moves at ${b}`);
      }
      heading.check(counts.move!);
    });
  }
});

/** The κ counts from enumerated ξ: moves per heading bin and cell, Σ ξ cos θ and Σ ξ sin θ per bin (θ from the cells' coordinates). */
function headingStats(model: HmmModel, nCells: number): { add: (hb: number, i: number, j: number, x: number) => void; check: (acc: MoveAccumulators) => void } {
  const moves = new Float64Array(72 * nCells);
  const cos = new Float64Array(72);
  const sin = new Float64Array(72);
  return {
    add(hb, i, j, x) {
      moves[hb * nCells + i] += x;
      const a = model.cells[i];
      const b = model.cells[j];
      if (a.level === b.level && (a.x !== b.x || a.y !== b.y)) {
        const theta = Math.atan2(b.y - a.y, b.x - a.x);
        cos[hb] += x * Math.cos(theta);
        sin[hb] += x * Math.sin(theta);
      }
    },
    check(acc) {
      for (let k = 0; k < moves.length; k++) expectClose(acc.moveByHeading[k], moves[k], TOL, `moves by heading ${k}`);
      for (let hb = 0; hb < 72; hb++) {
        expectClose(acc.headingCos[hb], cos[hb], TOL, `Σ ξ cos θ at heading bin ${hb}`);
        expectClose(acc.headingSin[hb], sin[hb], TOL, `Σ ξ sin θ at heading bin ${hb}`);
      }
    },
  };
}
