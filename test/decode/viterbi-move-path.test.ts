import { describe, it, expect, afterEach } from 'vitest';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { logChain } from '../../src/decode/log-chain.js';
import { viterbiMovePath } from '../../src/decode/viterbi-move-path.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { sampleOdometry } from '../../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';
import { wasmModule } from '../../src/kernels/wasm-module.js';
import { viterbiMoveSegmentWasm } from '../../src/kernels/viterbi-move-segment-wasm.js';
import { WasmMoveViterbi } from '../../src/kernels/wasm-move-viterbi.js';
import { randomMoveModel, randomMoveSteps } from '../helpers/movement-oracle.js';

// Oracle: the JavaScript kernel `viterbiMoveSegment` (checked against brute-force enumeration in
// test/reference/brute-force-movement.test.ts). The WebAssembly kernel does the same additions and
// comparisons (ties to the lowest cell index), so scores and paths must be equal exactly.

const realGrow = WebAssembly.Memory.prototype.grow;
afterEach(() => {
  WebAssembly.Memory.prototype.grow = realGrow;
});

describe('Viterbi with odometry as WebAssembly against the JavaScript kernel', () => {
  it('the module (1-, 2- and 4-byte back-pointers) is valid WebAssembly', () => {
    const bytes = wasmModule([1, 2, 4].map((w) => ({ name: `viterbi${w}`, fn: viterbiMoveSegmentWasm(w as 1 | 2 | 4) })));
    expect(WebAssembly.validate(bytes)).toBe(true);
    expect(WasmMoveViterbi.available()).toBe(true);
  });

  const rng = new SeededRandom(20261206);
  for (let trial = 0; trial < 20; trial++) {
    const nCells = 1 + rng.int(7);
    const nReadings = 2 + rng.int(3);
    const seed = rng.nextUint32();
    const T = 1 + rng.int(60);
    const obs = Int32Array.from({ length: T }, () => (rng.next() < 0.15 ? -1 : rng.int(nReadings)));
    const { dBin, hBin } = randomMoveSteps(rng, T);
    // Some zero distances and distances past the last bin as well.
    for (let t = 1; t < T; t++) if (rng.next() < 0.1) dBin[t] = rng.next() < 0.5 ? 0 : 2000;
    const limit = trial % 2 === 0 ? 1 << 26 : 4 * nCells; // every other trial checkpointed (segments of 4 steps)
    it(`same log-probability and path (trial ${trial}: ${nCells} cells, ${T} steps${trial % 2 ? ', checkpointed' : ''})`, () => {
      const chain = chainFromModel(randomMoveModel(seed, nCells, nReadings));
      const log = logChain(chain);
      const steps = { dBin: Int32Array.from(dBin), hBin: Int32Array.from(hBin) };
      const want = new Int32Array(T);
      const got = new Int32Array(T);
      const wantLogP = viterbiMovePath(chain, log, obs, steps, limit, want, false);
      const logP = viterbiMovePath(chain, log, obs, steps, limit, got, true);
      expect(logP).toBe(wantLogP);
      expect(Array.from(got)).toEqual(Array.from(want));
    });
  }

  it('a floor of 300 cells (2-byte back-pointers), runs sampled with odometry: same paths; JavaScript when memory cannot grow', () => {
    const model = randomMoveModel(99, 300, 4);
    const chain = chainFromModel(model);
    const log = logChain(chain);
    const local = new SeededRandom(5);
    const runs = [400, 900].map((T) => {
      const run = sampleRun(model, T, local, 0.05);
      const od = sampleOdometry(model, run.cells, local);
      return { obs: run.obs, steps: moveStepsFromOdometry(od.moved, od.heading), cells: run.cells };
    });
    const wants = runs.map((r) => {
      const want = new Int32Array(r.obs.length);
      return { want, logP: viterbiMovePath(chain, log, r.obs, r.steps, 1 << 16, want, false) };
    });
    runs.forEach((r, k) => {
      const got = new Int32Array(r.obs.length);
      expect(viterbiMovePath(chain, log, r.obs, r.steps, 1 << 16, got, true)).toBe(wants[k].logP);
      expect(Array.from(got)).toEqual(Array.from(wants[k].want));
      expect(Number.isFinite(wants[k].logP)).toBe(true);
    });
    // Growth refused: a longer run than before must still decode (in JavaScript), with the same path.
    WebAssembly.Memory.prototype.grow = function grow(): number {
      throw new RangeError('WebAssembly.Memory.grow(): Unable to grow instance memory');
    };
    const run = sampleRun(model, 3000, local, 0.05);
    const od = sampleOdometry(model, run.cells, local);
    const steps = moveStepsFromOdometry(od.moved, od.heading);
    const got = new Int32Array(3000);
    const logP = viterbiMovePath(chain, log, run.obs, steps, 1 << 26, got, true);
    WebAssembly.Memory.prototype.grow = realGrow;
    const want = new Int32Array(3000);
    expect(logP).toBe(viterbiMovePath(chain, log, run.obs, steps, 1 << 26, want, false));
    expect(Array.from(got)).toEqual(Array.from(want));
  });
});
