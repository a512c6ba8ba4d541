import { describe, it, expect, afterEach } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../../src/fit/fit-model.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { scoreBlock } from '../../src/fit/score-block.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { JsLaneKernels } from '../../src/kernels/js-lane-kernels.js';
import { WasmLaneKernels } from '../../src/kernels/wasm-lane-kernels.js';
import { wasmMemoryRefused } from '../../src/kernels/wasm-memory.js';
import { logChain } from '../../src/decode/log-chain.js';
import { viterbiPath } from '../../src/decode/viterbi-path.js';
import { gridFloor } from '../helpers/grid-floor.js';

// Oracle: the same computation with WebAssembly memory available (the JavaScript lane kernels are
// checked against the WebAssembly ones bit for bit in test/kernels/wasm-lane-kernels.test.ts). Here the
// runtime is made to refuse a WebAssembly memory, or its growth, as it does under an address-space
// limit (`ulimit -v`), and the results must not change by a bit. Floor and runs are invented.

const floor = gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x * 7 + y * 3) % 3);
const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
const rng = new SeededRandom(11);
const runs = Array.from({ length: 12 }, (_, r) => ({ id: `run-${r}`, obs: sampleRun(truth, 120 + 7 * r, rng, 0.05).obs }));

const RealMemory = WebAssembly.Memory;
const realGrow = WebAssembly.Memory.prototype.grow;
function refuseMemory(): void {
  (WebAssembly as { Memory: unknown }).Memory = function Memory() {
    throw new RangeError('WebAssembly.Memory(): could not allocate memory');
  };
}
function refuseGrowth(): void {
  WebAssembly.Memory.prototype.grow = function grow(): number {
    throw new RangeError('WebAssembly.Memory.grow(): Unable to grow instance memory');
  };
}
afterEach(() => {
  (WebAssembly as { Memory: unknown }).Memory = RealMemory;
  WebAssembly.Memory.prototype.grow = realGrow;
});

function countsOf(ws: EStepWorkspace) {
  const chain = chainFromModel(truth);
  const packed = packRuns(runs);
  const block = runs.map((_, r) => r);
  return { learned: accumulateBlock(chain, packed, block, ws, 'learned').counts, tied: accumulateBlock(chain, packed, block, ws, 'tied').counts, score: scoreBlock(chain, packed, block, ws) };
}

describe('the JavaScript kernels when WebAssembly memory cannot be had', () => {
  it('WasmLaneKernels.create() is null when the runtime refuses a memory', () => {
    refuseMemory();
    expect(WasmLaneKernels.create()).toBeNull();
    expect(wasmMemoryRefused()).toBe(true);
  });

  it('an E-step whose memory is refused, or whose memory cannot grow, gives the same bits', () => {
    const want = countsOf(new EStepWorkspace());
    for (const refuse of [refuseMemory, refuseGrowth]) {
      refuse();
      const ws = new EStepWorkspace();
      const got = countsOf(ws);
      expect(ws.useWasm).toBe(false);
      expect(ws.lanes()).toBeInstanceOf(JsLaneKernels);
      for (const mode of ['learned', 'tied'] as const) {
        expect(got[mode].logLik).toBe(want[mode].logLik);
        expect(Buffer.from(got[mode].trans.buffer).equals(Buffer.from(want[mode].trans.buffer))).toBe(true);
        expect(Buffer.from(got[mode].emitT.buffer).equals(Buffer.from(want[mode].emitT.buffer))).toBe(true);
        expect(Buffer.from(got[mode].start.buffer).equals(Buffer.from(want[mode].start.buffer))).toBe(true);
      }
      expect(got.score).toEqual(want.score);
      (WebAssembly as { Memory: unknown }).Memory = RealMemory;
      WebAssembly.Memory.prototype.grow = realGrow;
    }
  });

  itSlow('a whole fit gives byte-identical parameters and record without WebAssembly memory (1 and 2 threads)', async () => {
    const input = { floor, runs, floorDigest: 'x', runsDigests: [] };
    const options = { ...DEFAULT_FIT_OPTIONS, restarts: 2, maxIter: 15 };
    const want = await fitModel(input, options, 1);
    refuseMemory();
    // In this thread only: piscina's worker threads have their own WebAssembly.Memory (and keep it).
    for (const workers of [1, 2]) {
      const got = await fitModel(input, options, workers);
      expect(Buffer.from(got.model.emission.buffer).equals(Buffer.from(want.model.emission.buffer))).toBe(true);
      expect(Buffer.from(got.model.trans.buffer).equals(Buffer.from(want.model.trans.buffer))).toBe(true);
      expect(got.record).toEqual(want.record);
    }
  });

  it('viterbiPath decodes in JavaScript when its WebAssembly memory cannot grow, with the same path', () => {
    const chain = chainFromModel(truth);
    const log = logChain(chain);
    const short = runs[0].obs;
    const long = sampleRun(truth, 5000, new SeededRandom(3), 0.05).obs;
    const path = new Int32Array(long.length);
    viterbiPath(chain, log, short, 1 << 26, path); // the WebAssembly kernel, sized for the short run
    const want = new Int32Array(long.length);
    const wantLogP = viterbiPath(chain, log, long, 1 << 26, want, false);
    refuseGrowth();
    const logP = viterbiPath(chain, log, long, 1 << 26, path);
    expect(logP).toBe(wantLogP);
    expect(Array.from(path)).toEqual(Array.from(want));
  });
});
