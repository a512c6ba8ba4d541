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
import { decodeRun } from '../../src/decode/decode-run.js';
import { decodeLanes } from '../../src/decode/decode-lanes.js';
import { logLanes } from '../../src/decode/log-lanes.js';
import { positionLayout } from '../../src/decode/position-layout.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { sampleOdometry } from '../../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';
import { DEFAULT_MOVEMENT } from '../../src/model/default-movement.js';
import { WasmMoveLaneKernels } from '../../src/kernels/wasm-move-lane-kernels.js';

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

  it('an E-step with odometry (movement lanes) whose memory is refused, or cannot grow, gives the same bits', () => {
    const moving = { ...truth, movement: DEFAULT_MOVEMENT };
    const odoRng = new SeededRandom(12);
    const withMoves = Array.from({ length: 11 }, (_, r) => {
      const run = sampleRun(moving, 90 + 5 * r, odoRng, 0.05);
      const od = sampleOdometry(moving, run.cells, odoRng);
      return { id: `odo-${r}`, obs: run.obs, moves: moveStepsFromOdometry(od.moved, od.heading) };
    });
    const chain = chainFromModel(moving);
    const packed = packRuns(withMoves);
    const block = withMoves.map((_, r) => r);
    const bytes = (x: Float64Array): Buffer => Buffer.from(x.buffer, x.byteOffset, x.byteLength);
    const want = accumulateBlock(chain, packed, block, new EStepWorkspace(), 'tied').counts;
    for (const refuse of [refuseMemory, refuseGrowth]) {
      refuse();
      const ws = new EStepWorkspace();
      const got = accumulateBlock(chain, packed, block, ws, 'tied').counts;
      expect(ws.useWasm).toBe(false);
      // Refused memory: no kernels object; refused growth: one that could not be prepared.
      if (refuse === refuseMemory) expect(ws.moveLanes!.wasm).toBeNull();
      else expect(ws.moveLanes!.wasm).toBeInstanceOf(WasmMoveLaneKernels);
      expect(got.logLik).toBe(want.logLik);
      for (const key of ['trans', 'emitT', 'start'] as const) expect(bytes(got[key]).equals(bytes(want[key]))).toBe(true);
      for (const key of ['stayByDistance', 'moveByDistance', 'moveByHeading', 'headingCos', 'headingSin'] as const) {
        expect(bytes(got.move![key]).equals(bytes(want.move![key]))).toBe(true);
      }
      (WebAssembly as { Memory: unknown }).Memory = RealMemory;
      WebAssembly.Memory.prototype.grow = realGrow;
    }
    expect(want.move!.stayByDistance.some((x) => x > 0)).toBe(true);
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

  it('decodeLanes decodes each run alone when its WebAssembly memory cannot grow, with the same numbers', () => {
    const chain = chainFromModel(truth);
    const log = logChain(chain);
    const options = { positions: positionLayout(truth).groups };
    const group = runs.slice(0, 8).map((r) => r.obs);
    decodeLanes(chain, logLanes(chain, log), group.map((obs) => obs.subarray(0, 10)), options); // sized for short runs
    const long = [...group.slice(0, 7), sampleRun(truth, 6000, new SeededRandom(4), 0.05).obs];
    const want = long.map((obs) => decodeRun(chain, log, obs, options));
    refuseGrowth();
    const got = decodeLanes(chain, logLanes(chain, log), long, options);
    expect(wasmMemoryRefused()).toBe(true);
    got.forEach((d, k) => {
      expect(d.logLik).toBe(want[k].logLik);
      expect(Array.from(d.path)).toEqual(Array.from(want[k].path));
      expect(Array.from(d.entropyBits)).toEqual(Array.from(want[k].entropyBits));
      expect(Array.from(d.positions!.meanX)).toEqual(Array.from(want[k].positions!.meanX));
    });
  });
});
