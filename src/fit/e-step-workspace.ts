import type { MoveLaneBuffers } from './move-lane-buffers.js';
import { LANES, type LaneGroup, type SparseChain } from '../kernels/sparse-chain.js';
import type { LaneAccumulators, LaneKernels } from '../kernels/lane-kernels.js';
import { JsLaneKernels } from '../kernels/js-lane-kernels.js';
import { WasmLaneKernels } from '../kernels/wasm-lane-kernels.js';

/** Scratch of `forwardPruned` / `backwardPruned` (see there). */
export interface PrunedBuffers {
  kept: Int32Array;
  keptVal: Float64Array;
  keptPtr: Int32Array;
  acc: Float64Array;
  mark: Uint8Array;
  cand: Int32Array;
  out: Float64Array;
}

/** Forward tables above this size are processed in checkpointed segments (see `segmentSteps`). */
export const DEFAULT_PLAIN_LIMIT_BYTES = 128 * 1024 * 1024;

/**
 * Reusable buffers for the E-step and scoring, one run or one lane group at a time, grown on demand and
 * never shrunk, so a long fit allocates once per worker rather than once per run. Sizes are in numbers
 * (float64) unless said otherwise. The lane groups' own buffers live in `lanes()` (WebAssembly memory
 * when available).
 */
export class EStepWorkspace {
  /**
   * A run (or lane group) whose forward table would take more bytes than this is processed in
   * checkpointed segments (see `segmentSteps`): memory then stays near this limit, or grows with
   * √steps for very long runs, instead of growing with steps. @default 128 MiB
   */
  plainLimitBytes = DEFAULT_PLAIN_LIMIT_BYTES;
  /**
   * Run the lane kernels as WebAssembly SIMD where the runtime has it (same numbers, bit for bit, about
   * three times faster); false forces the JavaScript kernels. Set to false by `preparedLanes` when the
   * runtime refuses the WebAssembly kernels' memory (or its growth). @default true
   */
  useWasm = true;
  /** One run's forward table for a segment, with its entry row: (segment steps + 1) × cells. */
  table = new Float64Array(0);
  /** One run's scaling factors c_t: steps. */
  scale = new Float64Array(0);
  /** Forward vectors at the entry of every segment (checkpointed runs and groups): segments × cells × lanes. */
  checkpoints = new Float64Array(0);
  /** One run's ŵ vector of the backward pass and its ping-pong partner: cells each. */
  w = new Float64Array(0);
  wSpare = new Float64Array(0);
  /** One run's count accumulators, folded into the counts table when the run is done. */
  counts: LaneAccumulators = {
    emitCount: new Float64Array(0),
    linkCount: new Float64Array(0),
    dwellCount: new Float64Array(0),
    lastGamma: new Float64Array(0),
    startCount: new Float64Array(0),
  };
  /** Scratch for the log sums of recomputed segments (discarded). */
  logs = new Float64Array(LANES);
  /** The lane group being processed (its `rows` buffer grows on demand). */
  group: LaneGroup = { nSteps: 0, laneSteps: new Int32Array(LANES), rows: new Int32Array(0) };
  private laneKernels: LaneKernels | null = null;

  /**
   * The lane kernels, created on first use: WebAssembly SIMD when available and `useWasm`, else
   * JavaScript (also when the runtime refuses a WebAssembly memory).
   */
  lanes(): LaneKernels {
    const wasm = this.useWasm && WasmLaneKernels.available();
    if (this.laneKernels === null || (this.laneKernels instanceof WasmLaneKernels) !== wasm) {
      this.laneKernels = (wasm ? WasmLaneKernels.create() : null) ?? new JsLaneKernels();
      if (wasm && this.laneKernels instanceof JsLaneKernels) this.useWasm = false;
    }
    return this.laneKernels;
  }

  /**
   * The lane kernels prepared for `group` in segments of `segment` steps (`LaneKernels.prepare`). When
   * the WebAssembly kernels cannot have the memory for it, this workspace turns to the JavaScript
   * kernels for good (the same numbers, bit for bit); a RangeError from them means memory has run out.
   */
  preparedLanes(chain: SparseChain, group: LaneGroup, segment: number): LaneKernels {
    const lanes = this.lanes();
    if (lanes.prepare(chain, group, segment)) return lanes;
    this.useWasm = false;
    this.laneKernels = new JsLaneKernels();
    this.laneKernels.prepare(chain, group, segment);
    return this.laneKernels;
  }

  /**
   * Makes sure the one-run buffers hold a run of `nSteps` steps processed in segments of `segment`
   * steps over `nCells` cells, `nReadings` readings and `nLinks` links; returns this.
   */
  ensure(nCells: number, nReadings: number, nLinks: number, nSteps: number, segment: number): this {
    if (this.table.length < (segment + 1) * nCells) this.table = new Float64Array((segment + 1) * nCells);
    if (this.scale.length < nSteps) this.scale = new Float64Array(nSteps);
    if (this.w.length < nCells) {
      this.w = new Float64Array(nCells);
      this.wSpare = new Float64Array(nCells);
    }
    const c = this.counts;
    const grow = (x: Float64Array, size: number): Float64Array => (x.length < size ? new Float64Array(size) : x);
    c.emitCount = grow(c.emitCount, (nReadings + 1) * nCells);
    c.linkCount = grow(c.linkCount, nLinks);
    c.dwellCount = grow(c.dwellCount, nCells);
    c.lastGamma = grow(c.lastGamma, nCells);
    c.startCount = grow(c.startCount, nCells);
    return this;
  }

  /** Buffers of the pruned E-step (`addPrunedRunCounts`), made on first use. */
  pruned: PrunedBuffers | null = null;

  /**
   * Makes sure the pruned E-step's buffers serve a run of `nSteps` steps over `nCells` cells with room
   * for `keptCapacity` kept (step, cell) pairs (12 bytes each); returns them.
   */
  ensurePruned(nCells: number, nSteps: number, keptCapacity: number): PrunedBuffers {
    let b = this.pruned;
    if (b === null || b.acc.length < nCells) {
      b = { kept: new Int32Array(0), keptVal: new Float64Array(0), keptPtr: new Int32Array(0), acc: new Float64Array(nCells), mark: new Uint8Array(nCells), cand: new Int32Array(nCells + 1), out: new Float64Array(1) };
      this.pruned = b;
    }
    if (b.kept.length < keptCapacity) {
      b.kept = new Int32Array(keptCapacity);
      b.keptVal = new Float64Array(keptCapacity);
    }
    if (b.keptPtr.length < nSteps + 1) b.keptPtr = new Int32Array(nSteps + 1);
    return b;
  }

  private moveScratch = new Float64Array(0);
  /** Buffers of the movement lane kernels (`accumulateMoveLanes`), made on first use. */
  moveLanes: MoveLaneBuffers | null = null;

  /** Scratch of the movement kernels (2 · nCells numbers). */
  moveWork(nCells: number): Float64Array {
    if (this.moveScratch.length < 2 * nCells) this.moveScratch = new Float64Array(2 * nCells);
    return this.moveScratch;
  }

  /** Makes sure `checkpoints` holds `size` numbers; returns it. */
  ensureCheckpoints(size: number): Float64Array {
    if (this.checkpoints.length < size) this.checkpoints = new Float64Array(size);
    return this.checkpoints;
  }
}
