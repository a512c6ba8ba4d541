import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { LANES, type SparseChain } from '../../src/kernels/sparse-chain.js';
import { fillLaneGroup } from '../../src/kernels/fill-lane-group.js';
import type { LaneKernels } from '../../src/kernels/lane-kernels.js';
import { JsLaneKernels } from '../../src/kernels/js-lane-kernels.js';
import { WasmLaneKernels } from '../../src/kernels/wasm-lane-kernels.js';
import { wasmModule } from '../../src/kernels/wasm-module.js';
import { forwardLanesWasm } from '../../src/kernels/forward-lanes-wasm.js';
import { backwardLanesWasm } from '../../src/kernels/backward-lanes-wasm.js';
import { sleb, uleb } from '../../src/kernels/wasm-function.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { scoreBlock } from '../../src/fit/score-block.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';

// Oracle: the JavaScript lane kernels (`JsLaneKernels`), themselves checked against the plain Rabiner
// 1989 kernels in lane-kernels.test.ts. The WebAssembly kernels do the same arithmetic in the same order
// and must give the same numbers bit for bit. LEB128 values: WebAssembly Core Specification 2.0,
// section 5.2.2 (its examples: 624485 → e5 8e 26; −123456 → c0 bb 78), recalled from the specification.

/** Runs a whole E-step pass of one group through `kernels`, in segments of `segment` steps. */
function pass(kernels: LaneKernels, chain: SparseChain, runs: Int32Array[], segment: number, perLink: boolean) {
  const n = chain.nCells;
  const row = LANES * n;
  const group = fillLaneGroup(runs, n, chain.nReadings);
  const T = group.nSteps;
  const nSeg = Math.ceil(T / segment);
  kernels.prepare(chain, group, segment);
  const checkpoints = new Float64Array(nSeg * row);
  const logs = new Float64Array(LANES);
  const tables: number[][] = [];
  for (let g = 0; g < nSeg; g++) {
    if (g > 0) {
      kernels.table.copyWithin(0, segment * row, (segment + 1) * row);
      checkpoints.set(kernels.table.subarray(0, row), g * row);
    }
    kernels.forward(g * segment, Math.min(T, (g + 1) * segment), logs);
    // Rows 1… hold the segment's steps (row 0 is its entry: a copy, or unused in the first segment).
    tables.push(Array.from(kernels.table.subarray(row, (Math.min(T, (g + 1) * segment) - g * segment + 1) * row)));
  }
  kernels.resetBackward();
  for (let g = nSeg - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSeg - 1) {
      if (g > 0) kernels.table.set(checkpoints.subarray(g * row, (g + 1) * row), 0);
      kernels.forward(a, b, new Float64Array(LANES));
    }
    kernels.backward(a, b, perLink);
  }
  const acc = kernels.accumulators;
  const copy = (x: Float64Array, size: number): number[] => Array.from(x.subarray(0, size));
  const out = {
    logs: Array.from(logs),
    tables,
    emit: copy(acc.emitCount, (chain.nReadings + 1) * n),
    links: copy(acc.linkCount, chain.outPtr[n]),
    dwell: copy(acc.dwellCount, n),
    lastGamma: copy(acc.lastGamma, n),
    start: copy(acc.startCount, n),
  };
  for (const x of [acc.emitCount, acc.linkCount, acc.dwellCount, acc.lastGamma, acc.startCount]) x.fill(0);
  return out;
}

describe('WebAssembly lane kernels', () => {
  it('this runtime has WebAssembly SIMD (Node 20 does), so the fast kernels are in use', () => {
    expect(WasmLaneKernels.available()).toBe(true);
  });

  it('uleb/sleb encode the specification’s examples', () => {
    expect(uleb(624485)).toEqual([0xe5, 0x8e, 0x26]);
    expect(sleb(-123456)).toEqual([0xc0, 0xbb, 0x78]);
    expect(uleb(0)).toEqual([0]);
    expect(sleb(-1)).toEqual([0x7f]);
  });

  it('the module of the three kernels is valid WebAssembly', () => {
    const bytes = wasmModule([
      { name: 'forward', fn: forwardLanesWasm() },
      { name: 'backwardCounts', fn: backwardLanesWasm(true) },
      { name: 'backwardTotals', fn: backwardLanesWasm(false) },
    ]);
    expect(WebAssembly.validate(bytes)).toBe(true);
  });

  const model = randomModel(31, { nCells: 13, nReadings: 5, linksPerCell: 3, startShare: 0.5 });
  const chain = chainFromModel(model);
  const rng = new SeededRandom(4);
  const lengths = [70, 41, 70, 12, 66, 1, 35];
  const runs = lengths.map((T) => sampleRun(model, T, rng, 0.1).obs);

  for (const perLink of [true, false]) {
    for (const segment of [70, 9]) {
      it(`gives the JavaScript kernels’ tables, log-likelihoods and ${perLink ? 'per-link' : 'total'} counts bit for bit (segments of ${segment} steps, 7 ragged lanes)`, () => {
        const js = pass(new JsLaneKernels(), chain, runs, segment, perLink);
        const wasm = pass(WasmLaneKernels.create()!, chain, runs, segment, perLink);
        expect(wasm.tables).toEqual(js.tables);
        expect(wasm.logs).toEqual(js.logs);
        expect(wasm.emit).toEqual(js.emit);
        expect(wasm.dwell).toEqual(js.dwell);
        expect(wasm.start).toEqual(js.start);
        if (perLink) expect(wasm.links).toEqual(js.links);
        else expect(wasm.lastGamma).toEqual(js.lastGamma);
        expect(js.logs.slice(0, 7).every(Number.isFinite)).toBe(true);
      });
    }
  }

  it('one WasmLaneKernels serves chains and groups of different sizes in turn (memory grows, views renew)', () => {
    const kernels = WasmLaneKernels.create()!;
    const big = randomModel(8, { nCells: 40, nReadings: 3 });
    const bigChain = chainFromModel(big);
    const bigRuns = [300, 280, 290].map((T) => sampleRun(big, T, rng, 0).obs);
    const first = pass(kernels, chain, runs, 70, true);
    const second = pass(kernels, bigChain, bigRuns, 300, false);
    const again = pass(kernels, chain, runs, 70, true);
    expect(again).toEqual(first);
    expect(second).toEqual(pass(new JsLaneKernels(), bigChain, bigRuns, 300, false));
  });

  it('accumulateBlock and scoreBlock give the same bits with and without WebAssembly', () => {
    const packed = packRuns(runs.map((obs, r) => ({ id: `r${r}`, obs })));
    const block = runs.map((_, r) => r);
    const wasmWs = new EStepWorkspace();
    const jsWs = new EStepWorkspace();
    jsWs.useWasm = false;
    for (const mode of ['learned', 'tied'] as const) {
      const a = accumulateBlock(chain, packed, block, wasmWs, mode).counts;
      const b = accumulateBlock(chain, packed, block, jsWs, mode).counts;
      expect(a.logLik).toBe(b.logLik);
      expect(Array.from(a.trans)).toEqual(Array.from(b.trans));
      expect(Array.from(a.emitT)).toEqual(Array.from(b.emitT));
      expect(Array.from(a.start)).toEqual(Array.from(b.start));
    }
    expect(scoreBlock(chain, packed, block, wasmWs)).toEqual(scoreBlock(chain, packed, block, jsWs));
  });
});
