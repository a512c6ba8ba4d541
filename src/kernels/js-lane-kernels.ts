import { LANES, type LaneGroup, type SparseChain } from './sparse-chain.js';
import type { LaneAccumulators, LaneKernels } from './lane-kernels.js';
import { forwardLanes } from './forward-lanes.js';
import { backwardCountsLanes } from './backward-counts-lanes.js';
import { backwardTotalsLanes } from './backward-totals-lanes.js';

/**
 * The lane kernels in JavaScript (`forwardLanes`, `backwardCountsLanes`, `backwardTotalsLanes`) behind
 * the `LaneKernels` interface, with their buffers grown on demand and never shrunk. The reference for
 * `WasmLaneKernels`, and the fallback where WebAssembly SIMD is missing.
 */
export class JsLaneKernels implements LaneKernels {
  table = new Float64Array(0);
  accumulators: LaneAccumulators = {
    emitCount: new Float64Array(0),
    linkCount: new Float64Array(0),
    dwellCount: new Float64Array(0),
    lastGamma: new Float64Array(0),
    startCount: new Float64Array(0),
  };
  private scale = new Float64Array(0);
  private w = new Float64Array(0);
  private wSpare = new Float64Array(0);
  private chain: SparseChain | null = null;
  private group: LaneGroup | null = null;

  prepare(chain: SparseChain, group: LaneGroup, segment: number): true {
    const n = chain.nCells;
    const row = LANES * n;
    if (this.table.length < (segment + 1) * row) this.table = new Float64Array((segment + 1) * row);
    if (this.scale.length < group.nSteps * LANES) this.scale = new Float64Array(group.nSteps * LANES);
    if (this.w.length < row) {
      this.w = new Float64Array(row);
      this.wSpare = new Float64Array(row);
    }
    const a = this.accumulators;
    const grow = (x: Float64Array, size: number): Float64Array => (x.length < size ? new Float64Array(size) : x);
    a.emitCount = grow(a.emitCount, (chain.nReadings + 1) * n);
    a.linkCount = grow(a.linkCount, chain.outPtr[n]);
    a.dwellCount = grow(a.dwellCount, n);
    a.lastGamma = grow(a.lastGamma, n);
    a.startCount = grow(a.startCount, n);
    this.chain = chain;
    this.group = group;
    return true;
  }

  forward(t0: number, t1: number, logOut: Float64Array): void {
    forwardLanes(this.chain!, this.group!, t0, t1, this.table, this.scale, logOut);
  }

  resetBackward(): void {
    this.w.fill(0);
  }

  backward(t0: number, t1: number, perLink: boolean): void {
    const a = this.accumulators;
    if (perLink) backwardCountsLanes(this.chain!, this.group!, t0, t1, this.table, this.scale, this.w, this.wSpare, a.emitCount, a.linkCount, a.dwellCount, a.startCount);
    else backwardTotalsLanes(this.chain!, this.group!, t0, t1, this.table, this.scale, this.w, this.wSpare, a.emitCount, a.dwellCount, a.lastGamma, a.startCount);
  }
}
