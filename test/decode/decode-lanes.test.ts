import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fcSeed } from '../helpers/fc-seed.js';
import { randomModel } from '../helpers/random-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { logChain } from '../../src/decode/log-chain.js';
import { decodeRun, type DecodedRun } from '../../src/decode/decode-run.js';
import { decodeLanes } from '../../src/decode/decode-lanes.js';
import { logLanes } from '../../src/decode/log-lanes.js';
import { positionLayout } from '../../src/decode/position-layout.js';
import { WasmDecodeLanes } from '../../src/kernels/wasm-decode-lanes.js';
import type { HmmModel } from '../../src/model/hmm-model.js';

// Oracle: `decodeRun`, one run at a time (itself checked against brute-force enumeration in
// test/reference). The lane decoders must give its numbers bit for bit: every comparison here is exact
// (Object.is, so NaN equals NaN and −0 differs from +0). Models and runs are invented (seeded random).

function expectIdentical(got: DecodedRun, want: DecodedRun, label: string): void {
  const same = (a: ArrayLike<number>, b: ArrayLike<number>, what: string): void => {
    expect(a.length, `${label} ${what} length`).toBe(b.length);
    for (let t = 0; t < b.length; t++) if (!Object.is(a[t], b[t])) expect(a[t], `${label} ${what} at step ${t}`).toBe(b[t]);
  };
  expect(Object.is(got.logLik, want.logLik), `${label} logLik ${got.logLik} vs ${want.logLik}`).toBe(true);
  expect(Object.is(got.pathLogProb, want.pathLogProb), `${label} pathLogProb ${got.pathLogProb} vs ${want.pathLogProb}`).toBe(true);
  same(got.path, want.path, 'path');
  same(got.pathP, want.pathP, 'path_p');
  same(got.likelyCell, want.likelyCell, 'likely_cell');
  same(got.likelyP, want.likelyP, 'likely_p');
  same(got.entropyBits, want.entropyBits, 'entropy');
  same(got.surpriseBits, want.surpriseBits, 'surprise');
  expect(got.positions === null, `${label} positions present`).toBe(want.positions === null);
  if (got.positions && want.positions) {
    for (const key of ['likelyZone', 'zoneP', 'meanLevel', 'meanX', 'meanY', 'spreadM'] as const) same(got.positions[key], want.positions[key], key);
  }
}

/** Gives the model's cells invented positions on two levels and, when `zones`, a few zones (some cells without one). */
function placeCells(model: HmmModel, seed: number, zones: boolean): HmmModel {
  const rng = new SeededRandom(seed);
  return {
    ...model,
    cells: model.cells.map((c, i) => ({
      ...c,
      x: 100 + 10 * rng.next(),
      y: -50 + 10 * rng.next(),
      level: i % 3 === 0 ? 1 : 0,
      ...(zones && i % 4 !== 3 ? { zone: `z${i % 3}` } : {}),
    })),
  };
}

const modes = WasmDecodeLanes.available() ? ([true, false] as const) : ([false] as const);

describe('decodeLanes equals decodeRun, bit for bit', () => {
  for (const useWasm of modes) {
    const kind = useWasm ? 'WebAssembly' : 'JavaScript';
    it(`${kind}: random models, runs of different lengths in one group (lengths 1 …), dropouts, zones, checkpointing`, () => {
      fc.assert(
        fc.property(
          fc.record({
            seed: fc.integer({ min: 1, max: 1e6 }),
            nCells: fc.integer({ min: 1, max: 40 }),
            nReadings: fc.integer({ min: 1, max: 5 }),
            links: fc.integer({ min: 1, max: 5 }),
            lengths: fc.array(fc.integer({ min: 0, max: 60 }), { minLength: 1, maxLength: 8 }),
            dropout: fc.constantFrom(0, 0.2, 0.9, 1),
            zones: fc.boolean(),
            positions: fc.boolean(),
            limit: fc.constantFrom(undefined, 2000, 40000),
          }),
          (p) => {
            const model = placeCells(randomModel(p.seed, { nCells: p.nCells, nReadings: p.nReadings, linksPerCell: p.links, startShare: 0.5 }), p.seed, p.zones);
            const chain = chainFromModel(model);
            const log = logChain(chain);
            const rng = new SeededRandom(p.seed + 1);
            const runs = p.lengths.map((T) => sampleRun(model, T, rng, p.dropout).obs);
            const options = { positions: p.positions ? positionLayout(model).groups : undefined, plainLimitBytes: p.limit };
            const got = decodeLanes(chain, logLanes(chain, log), runs, { ...options, useWasm });
            runs.forEach((obs, k) => expectIdentical(got[k], decodeRun(chain, log, obs, options), `run ${k} (${obs.length} steps)`));
          },
        ),
        { seed: fcSeed, numRuns: 60 },
      );
    });

    it(`${kind}: impossible runs (a reading no cell emits) beside possible ones, and a model with zero probabilities`, () => {
      const base = placeCells(randomModel(5, { nCells: 12, nReadings: 3, linksPerCell: 3, startShare: 0.4 }), 5, true);
      // Reading 2 from no cell: a run that holds it is impossible.
      const emission = base.emission.slice();
      for (let i = 0; i < 12; i++) {
        const row = i * 3;
        const moved = emission[row + 2];
        emission[row + 2] = 0;
        emission[row] += moved;
      }
      const model = { ...base, emission };
      const chain = chainFromModel(model);
      const log = logChain(chain);
      const rng = new SeededRandom(8);
      const runs = [40, 1, 25, 40, 3].map((T) => sampleRun(model, T, rng, 0.1).obs);
      runs[0][30] = 2;
      runs[2][0] = 2;
      runs[3][1] = 2;
      runs[3][39] = 2;
      const options = { positions: positionLayout(model).groups };
      const got = decodeLanes(chain, logLanes(chain, log), runs, { ...options, useWasm });
      let impossible = 0;
      runs.forEach((obs, k) => {
        const want = decodeRun(chain, log, obs, options);
        if (want.logLik === -Infinity) impossible++;
        expectIdentical(got[k], want, `run ${k}`);
      });
      expect(impossible).toBe(3);
    });
  }

  it('the WebAssembly and JavaScript lane decoders agree on a larger floor (600 cells: two-byte back-pointers)', () => {
    if (!WasmDecodeLanes.available()) return;
    const model = placeCells(randomModel(11, { nCells: 600, nReadings: 6, linksPerCell: 4 }), 11, false);
    const chain = chainFromModel(model);
    const lanes = logLanes(chain, logChain(chain));
    const rng = new SeededRandom(12);
    const runs = [120, 80, 120, 7, 119, 60, 1, 100].map((T) => sampleRun(model, T, rng, 0.2).obs);
    const options = { positions: positionLayout(model).groups, plainLimitBytes: 300000 };
    const a = decodeLanes(chain, lanes, runs, { ...options, useWasm: true });
    const b = decodeLanes(chain, lanes, runs, { ...options, useWasm: false });
    runs.forEach((_, k) => expectIdentical(a[k], b[k], `run ${k}`));
    runs.forEach((obs, k) => expectIdentical(a[k], decodeRun(chain, logChain(chain), obs, options), `run ${k} vs decodeRun`));
  });
});
