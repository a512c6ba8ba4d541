import { describe, it, expect } from 'vitest';
import { buildModel } from '../../src/model/build-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { posteriorMarginals } from '../../src/kernels/posterior-marginals.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';
import { expectAllClose, expectClose } from '../helpers/close.js';
import { tinyModel } from '../helpers/tiny-model.js';

// Published values are given to 4 decimals: compare to half a unit in the last place.
const FOUR_DECIMALS = { abs: 0.00005 };

describe('umbrella world through the floor model builder', () => {
  // Source: Wikipedia, "Forward–backward algorithm", section "Example" (umbrella world): transitions
  // 0.7 stay / 0.3 change, P(umbrella | rain) = 0.9, P(umbrella | no rain) = 0.2, uniform prior,
  // observations umbrella, umbrella, no umbrella, umbrella, umbrella. The page's tables are normalised
  // forward messages f_{0:t} and normalised backward messages b_{t:5}; the values below are the page's
  // (as quoted in issue 2 for the smoothed values and log P; forward/backward rows recalled from the page
  // and re-derived by hand to 4 decimals).
  const floor: FloorGraph = {
    format: 'underfoot-floor/1',
    name: 'umbrella world',
    surfaces: ['umbrella', 'no-umbrella'],
    cells: [
      { id: 'rain', surface: 'umbrella', x: 0, y: 0, level: 0, start: false },
      { id: 'dry', surface: 'no-umbrella', x: 1, y: 0, level: 0, start: false },
    ],
    links: [{ from: 'rain', to: 'dry', oneway: false }],
  };
  const model = buildModel(floor, { dwell: 0.7, hit: 0.9 });
  model.emission.set([0.9, 0.1, 0.2, 0.8]);
  const chain = chainFromModel(model);
  const obs = Int32Array.from([0, 0, 1, 0, 0]);
  const T = obs.length;
  const alpha = new Float64Array(2 * T);
  const scale = new Float64Array(T);
  const beta = new Float64Array(2 * T);
  const gamma = new Float64Array(2 * T);
  const logP = forwardScaled(chain, obs, T, alpha, scale);
  backwardScaled(chain, obs, T, scale, beta);
  posteriorMarginals(2, T, alpha, beta, gamma);

  it('buildModel(floor) gives the example transitions 0.7 / 0.3 and the uniform start', () => {
    expectAllClose(model.trans, [0.7, 0.3, 0.3, 0.7], { abs: 1e-15 }, 'transitions');
    expect(Array.from(model.start)).toEqual([0.5, 0.5]);
  });

  it('forwardScaled matches the published normalised forward messages', () => {
    const published = [
      [0.8182, 0.1818],
      [0.8834, 0.1166],
      [0.1907, 0.8093],
      [0.7308, 0.2692],
      [0.8673, 0.1327],
    ];
    expectAllClose(alpha, published.flat(), FOUR_DECIMALS, 'forward');
  });

  it('backwardScaled rows, normalised, match the published backward messages', () => {
    const published = [
      [0.5923, 0.4077],
      [0.3763, 0.6237],
      [0.6533, 0.3467],
      [0.6273, 0.3727],
      [1.0, 1.0],
    ];
    for (let t = 0; t < T; t++) {
      const s = t === T - 1 ? 1 : beta[2 * t] + beta[2 * t + 1];
      expectAllClose([beta[2 * t] / s, beta[2 * t + 1] / s], published[t], FOUR_DECIMALS, `backward t=${t}`);
    }
  });

  it('log P(readings) = −3.3725 and smoothed P(rain) = 0.8673, 0.8204, 0.3075, 0.8204, 0.8673', () => {
    expectClose(logP, -3.3725, FOUR_DECIMALS, 'log P');
    const rain = [0, 1, 2, 3, 4].map((t) => gamma[2 * t]);
    expectAllClose(rain, [0.8673, 0.8204, 0.3075, 0.8204, 0.8673], FOUR_DECIMALS, 'smoothed');
  });
});

describe('Viterbi worked examples', () => {
  it('decodeRun on healthy/fever, normal-cold-dizzy gives Healthy, Healthy, Fever with probability 0.01512', () => {
    // Source: Wikipedia, "Viterbi algorithm", section "Example" (current version): start Healthy 0.6,
    // Fever 0.4; transitions H→H 0.7, H→F 0.3, F→H 0.4, F→F 0.6; emissions Healthy: normal 0.5,
    // cold 0.4, dizzy 0.1; Fever: normal 0.1, cold 0.3, dizzy 0.6. Published answer: the most likely
    // states are Healthy, Healthy, Fever with probability 0.01512.
    const model = tinyModel([0.6, 0.4], [[0.7, 0.3], [0.4, 0.6]], [[0.5, 0.4, 0.1], [0.1, 0.3, 0.6]], ['normal', 'cold', 'dizzy'], ['Healthy', 'Fever']);
    const chain = chainFromModel(model);
    const out = decodeRun(chain, logChain(chain), Int32Array.from([0, 1, 2]));
    expect(Array.from(out.path, (i) => model.cells[i].id)).toEqual(['Healthy', 'Healthy', 'Fever']);
    expectClose(Math.exp(out.pathLogProb), 0.01512, { abs: 5e-7 }, 'path probability');
  });

  it('decodeRun on rainy/sunny, walk-shop-clean gives Sunny, Rainy, Rainy with probability 0.01344', () => {
    // Source: Wikipedia, "Viterbi algorithm", earlier published version of the example: start Rainy 0.6,
    // Sunny 0.4; transitions R→R 0.7, R→S 0.3, S→R 0.4, S→S 0.6; emissions Rainy: walk 0.1, shop 0.4,
    // clean 0.5; Sunny: walk 0.6, shop 0.3, clean 0.1. Published answer: Sunny, Rainy, Rainy, 0.01344.
    const model = tinyModel([0.6, 0.4], [[0.7, 0.3], [0.4, 0.6]], [[0.1, 0.4, 0.5], [0.6, 0.3, 0.1]], ['walk', 'shop', 'clean'], ['Rainy', 'Sunny']);
    const chain = chainFromModel(model);
    const out = decodeRun(chain, logChain(chain), Int32Array.from([0, 1, 2]));
    expect(Array.from(out.path, (i) => model.cells[i].id)).toEqual(['Sunny', 'Rainy', 'Rainy']);
    expectClose(Math.exp(out.pathLogProb), 0.01344, { abs: 5e-7 }, 'path probability');
  });
});
