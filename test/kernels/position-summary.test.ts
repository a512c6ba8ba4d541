import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { logChain } from '../../src/decode/log-chain.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { positionLayout } from '../../src/decode/position-layout.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { posteriorMarginals } from '../../src/kernels/posterior-marginals.js';
import { positionSummary, positionWorkSize, type PositionPass } from '../../src/kernels/position-summary.js';
import type { HmmModel } from '../../src/model/hmm-model.js';

// Oracle: the plain posterior marginals γ_t(i) = α̂_t(i) β̂_t(i) from the one-pass reference kernels
// (forwardScaled, backwardScaled, posteriorMarginals; Rabiner 1989, Proc. IEEE 77(2), eqs. 18–27),
// and zone sums, means and spreads computed directly from them (two passes, no moments).
// Models, zones and coordinates are invented (seeded random).

/** A random model with cells spread over levels and zones (about a quarter of the cells without a zone), far from the origin. */
function zonedModel(seed: number, nCells: number): HmmModel {
  const base = randomModel(seed, { nCells, nReadings: 4, linksPerCell: 3, startShare: 0.5 });
  const rng = new SeededRandom(seed + 1000);
  const cells = base.cells.map((c) => {
    const zone = rng.next() < 0.25 ? undefined : `zone ${rng.int(4)}`;
    const cell = { ...c, x: 5000 + 30 * rng.next(), y: -2000 + 20 * rng.next(), level: rng.int(3) - 1 };
    return zone === undefined ? cell : { ...cell, zone };
  });
  return { ...base, cells };
}

function referenceGamma(model: HmmModel, obs: Int32Array): Float64Array {
  const chain = chainFromModel(model);
  const n = chain.nCells;
  const T = obs.length;
  const alpha = new Float64Array(n * T);
  const scale = new Float64Array(T);
  forwardScaled(chain, obs, T, alpha, scale);
  const beta = new Float64Array(n * T);
  backwardScaled(chain, obs, T, scale, beta);
  const gamma = new Float64Array(n * T);
  posteriorMarginals(n, T, alpha, beta, gamma);
  return gamma;
}

/** Per area (as `positionLayout` numbers them) Σ γ, directly. */
function areaSums(model: HmmModel, gammaT: ArrayLike<number>): Map<string, number> {
  const sums = new Map<string, number>();
  model.cells.forEach((c, i) => {
    const key = c.zone ?? `cell:${c.id}`;
    sums.set(key, (sums.get(key) ?? 0) + gammaT[i]);
  });
  return sums;
}

describe('positionSummary', () => {
  it('area sums equal the plain posterior marginals summed over each zone (1e-12), on random small models', () => {
    for (const seed of [1, 2, 3, 4, 5]) {
      const model = zonedModel(seed, 9 + seed * 3);
      const n = model.cells.length;
      const layout = positionLayout(model);
      const obs = sampleRun(model, 120, new SeededRandom(seed), 0.1).obs;
      const gamma = referenceGamma(model, obs);
      const T = obs.length;
      const out = {
        likelyZone: new Int32Array(T), zoneP: new Float64Array(T), meanLevel: new Int32Array(T),
        meanX: new Float64Array(T), meanY: new Float64Array(T), spreadM: new Float64Array(T),
      };
      const pass: PositionPass = { groups: layout.groups, gamma: new Float64Array(n), work: new Float64Array(positionWorkSize(layout.groups)), out };
      for (let t = 0; t < T; t++) {
        pass.gamma.set(gamma.subarray(t * n, (t + 1) * n));
        positionSummary(n, pass, t);
        const direct = areaSums(model, pass.gamma);
        expect(direct.size, 'areas').toBe(layout.groups.nZones);
        layout.zoneNames.forEach((name, z) => {
          // Named zones by name; unnamed areas are single cells, in cell order.
          const key = name !== '' ? name : `cell:${model.cells[[...layout.groups.zoneOf].indexOf(z)].id}`;
          expectClose(pass.work[z], direct.get(key) as number, { abs: 1e-12 }, `seed ${seed} t ${t} area ${key}`);
        });
        let total = 0;
        for (let z = 0; z < layout.groups.nZones; z++) total += pass.work[z];
        expectClose(total, 1, { abs: 1e-12 }, 'areas sum to 1');
      }
    }
  });
});

describe('decodeRun with positions', () => {
  for (const limit of [Infinity, 0]) {
    const label = limit === 0 ? 'checkpointed' : 'plain';
    it(`${label}: zone_p, likely zone, mean and spread on the most likely level match a direct computation from the posterior marginals`, () => {
      for (const seed of [11, 12, 13]) {
        const model = zonedModel(seed, 16);
        const n = model.cells.length;
        const chain = chainFromModel(model);
        const layout = positionLayout(model);
        const obs = sampleRun(model, 300, new SeededRandom(seed), 0.1).obs;
        const dec = decodeRun(chain, logChain(chain), obs, { plainLimitBytes: limit, positions: layout.groups });
        const gamma = referenceGamma(model, obs);
        const pos = dec.positions!;
        for (let t = 0; t < obs.length; t++) {
          const g = gamma.subarray(t * n, (t + 1) * n);
          const sums = [...areaSums(model, g).entries()];
          const best = Math.max(...sums.map(([, p]) => p));
          expectClose(pos.zoneP[t], best, { abs: 1e-12 }, `seed ${seed} zone_p ${t}`);
          const name = layout.zoneNames[pos.likelyZone[t]];
          const chosen = sums.find(([key]) => key === name || (name === '' && key.startsWith('cell:') && model.cells[[...layout.groups.zoneOf].indexOf(pos.likelyZone[t])].id === key.slice(5)));
          expect(chosen, `t ${t} chosen area exists`).toBeDefined();
          expectClose(chosen![1], best, { abs: 1e-12 }, `t ${t} chosen area holds the most`);
          // Level masses, then mean and RMS distance on the heaviest level, two-pass.
          const massOf = new Map<number, number>();
          model.cells.forEach((c, i) => massOf.set(c.level, (massOf.get(c.level) ?? 0) + g[i]));
          const level = layout.levels[pos.meanLevel[t]];
          const heaviest = Math.max(...massOf.values());
          expectClose(massOf.get(level)!, heaviest, { abs: 1e-12 }, `t ${t} level mass`);
          const M = massOf.get(level)!;
          let mx = 0;
          let my = 0;
          model.cells.forEach((c, i) => {
            if (c.level === level) {
              mx += (g[i] / M) * c.x;
              my += (g[i] / M) * c.y;
            }
          });
          let ss = 0;
          model.cells.forEach((c, i) => {
            if (c.level === level) ss += (g[i] / M) * ((c.x - mx) ** 2 + (c.y - my) ** 2);
          });
          expectClose(pos.meanX[t], mx, { abs: 1e-9 }, `t ${t} mean x`);
          expectClose(pos.meanY[t], my, { abs: 1e-9 }, `t ${t} mean y`);
          expectClose(pos.spreadM[t], Math.sqrt(ss), { abs: 1e-6 }, `t ${t} spread`);
        }
      }
    });

    it(`${label}: the existing outputs are bit-identical with and without positions`, () => {
      const model = zonedModel(21, 20);
      const chain = chainFromModel(model);
      const log = logChain(chain);
      const obs = sampleRun(model, 400, new SeededRandom(5), 0.1).obs;
      const without = decodeRun(chain, log, obs, { plainLimitBytes: limit });
      const withPos = decodeRun(chain, log, obs, { plainLimitBytes: limit, positions: positionLayout(model).groups });
      expect(without.positions).toBeNull();
      expect(Object.is(withPos.logLik, without.logLik)).toBe(true);
      expect(Object.is(withPos.pathLogProb, without.pathLogProb)).toBe(true);
      for (const key of ['path', 'pathP', 'likelyCell', 'likelyP', 'entropyBits', 'surpriseBits'] as const) {
        const a = withPos[key];
        const b = without[key];
        expect(a.length).toBe(b.length);
        for (let t = 0; t < a.length; t++) if (!Object.is(a[t], b[t])) expect.fail(`${key}[${t}]: ${a[t]} vs ${b[t]}`);
      }
    });
  }

  it('a model without zones makes every cell an unnamed area: zone_p is the most likely cell\'s posterior', () => {
    const model = randomModel(31, { nCells: 12, nReadings: 3 });
    const chain = chainFromModel(model);
    const layout = positionLayout(model);
    expect(layout.hasZones).toBe(false);
    expect(layout.zoneNames).toEqual(new Array(12).fill(''));
    const obs = sampleRun(model, 100, new SeededRandom(3), 0).obs;
    const dec = decodeRun(chain, logChain(chain), obs, { positions: layout.groups });
    for (let t = 0; t < obs.length; t++) {
      expect(dec.positions!.likelyZone[t]).toBe(dec.likelyCell[t]);
      expect(Object.is(dec.positions!.zoneP[t], dec.likelyP[t])).toBe(true);
    }
  });
});
