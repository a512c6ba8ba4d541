import { LANES, type LaneGroup, type SparseChain } from './sparse-chain.js';
import type { DecodeLaneKernels, LogLanes } from './decode-lane-kernels.js';
import { positionWorkSize, type PositionGroups } from './position-summary.js';
import { forwardLanes } from './forward-lanes.js';
import { viterbiLanes } from './viterbi-lanes.js';
import { newLaneSummaries, posteriorSummaryLanes, type LaneSummaries } from './posterior-summary-lanes.js';

/**
 * The lane decode kernels in JavaScript (`viterbiLanes`, `forwardLanes`, `posteriorSummaryLanes`) behind
 * `DecodeLaneKernels`, buffers grown on demand. The reference for `WasmDecodeLanes`, and its fallback.
 */
export class JsDecodeLanes implements DecodeLaneKernels {
  delta = new Float64Array(0);
  back: Uint8Array | Uint16Array | Int32Array = new Uint8Array(0);
  last = new Float64Array(0);
  table = new Float64Array(0);
  scale = new Float64Array(0);
  path = new Int32Array(0);
  out: LaneSummaries = newLaneSummaries(0, false);
  private w = new Float64Array(0);
  private wSpare = new Float64Array(0);
  private gamma = new Float64Array(0);
  private work = new Float64Array(0);
  private chain: SparseChain | null = null;
  private log: LogLanes | null = null;
  private group: LaneGroup | null = null;
  private positions: PositionGroups | null = null;

  prepare(chain: SparseChain, log: LogLanes, group: LaneGroup, viterbiSegment: number, segment: number, positions: PositionGroups | null): true {
    const n = chain.nCells;
    const row = LANES * n;
    const width = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
    this.delta = new Float64Array(2 * row);
    this.back = width === 1 ? new Uint8Array(viterbiSegment * row) : width === 2 ? new Uint16Array(viterbiSegment * row) : new Int32Array(viterbiSegment * row);
    this.last = new Float64Array(row);
    this.table = new Float64Array((segment + 1) * row);
    this.scale = new Float64Array(group.nSteps * LANES);
    this.path = new Int32Array(segment * LANES);
    this.out = newLaneSummaries(segment, positions !== null);
    this.w = new Float64Array(row);
    this.wSpare = new Float64Array(row);
    this.gamma = new Float64Array(row);
    this.work = new Float64Array(positions ? positionWorkSize(positions) : 0);
    this.chain = chain;
    this.log = log;
    this.group = group;
    this.positions = positions;
    return true;
  }

  viterbi(t0: number, t1: number): void {
    const c = this.chain!;
    const l = this.log!;
    viterbiLanes(c.nCells, l.logStart, l.logDwell, c.inPtr, c.inIdx, l.inSplit, l.logInProb, l.logEmitT, this.group!, t0, t1, this.delta, this.back, this.last);
  }

  forward(t0: number, t1: number, logOut: Float64Array): void {
    forwardLanes(this.chain!, this.group!, t0, t1, this.table, this.scale, logOut);
  }

  resetBackward(): void {
    this.w.fill(0);
  }

  summary(t0: number, t1: number): void {
    posteriorSummaryLanes(this.chain!, this.group!, t0, t1, this.table, this.scale, this.path, this.w, this.wSpare, this.gamma, this.out, this.positions, this.work);
  }
}
