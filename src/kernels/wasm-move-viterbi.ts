import type { SparseChain } from './sparse-chain.js';
import type { MoveSteps } from './move-chain.js';
import { wasmModule } from './wasm-module.js';
import { viterbiMoveSegmentWasm } from './viterbi-move-segment-wasm.js';
import { growWasmMemory, newWasmMemory } from './wasm-memory.js';

type Pointers = Uint8Array | Uint16Array | Int32Array;
interface MoveViterbiExports {
  viterbi1(...args: number[]): void;
  viterbi2(...args: number[]): void;
  viterbi4(...args: number[]): void;
}

let compiled: WebAssembly.Module | null | undefined;

function moveViterbiModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      compiled = new WebAssembly.Module(
        wasmModule([
          { name: 'viterbi1', fn: viterbiMoveSegmentWasm(1) },
          { name: 'viterbi2', fn: viterbiMoveSegmentWasm(2) },
          { name: 'viterbi4', fn: viterbiMoveSegmentWasm(4) },
        ]),
      );
    } catch {
      compiled = null;
    }
  }
  return compiled;
}

const align = (bytes: number): number => Math.ceil(bytes / 16) * 16;

/** The logs `viterbiMoveSegment` reads, made by the caller once per run. */
export interface MoveViterbiLogs {
  logStart: Float64Array;
  logDwell: Float64Array;
  logDwellGo: Float64Array;
  logStay: Float64Array;
  logGo: Float64Array;
  logSplitIn: Float64Array;
  logEmitT: Float64Array;
}

/**
 * `viterbiMoveSegment` as WebAssembly (`viterbiMoveSegmentWasm`) for one run with odometry at a time:
 * the same scores and back-pointers. As `WasmViterbi`: `prepare` lays out this object's memory for the
 * chain's logs, the run's readings and odometry bins and a segment of back-pointers, and returns views
 * on `delta` (2 · nCells) and the back-pointers, valid until the next `prepare`; `create` returns null
 * when the runtime refuses a memory and `prepare` null when it refuses to grow it (the caller then runs
 * `viterbiMoveSegment` in JavaScript).
 */
export class WasmMoveViterbi {
  /** True where this runtime compiles the module. */
  static available(): boolean {
    return typeof WebAssembly === 'object' && moveViterbiModule() !== null;
  }

  private readonly kernels: MoveViterbiExports;
  private at: Record<string, number> = {};
  private n = 0;
  private m = 0;
  private links = 0;
  private headingBins = 0;
  private width: 1 | 2 | 4 = 1;

  /** The kernel with a memory of its own, or null when the runtime refuses one (see `newWasmMemory`). */
  static create(): WasmMoveViterbi | null {
    const memory = newWasmMemory();
    return memory === null ? null : new WasmMoveViterbi(memory);
  }

  private constructor(private readonly memory: WebAssembly.Memory) {
    const module = moveViterbiModule();
    if (module === null) throw new Error('WasmMoveViterbi: WebAssembly must be available, got a runtime without it');
    this.kernels = new WebAssembly.Instance(module, { env: { memory: this.memory } }).exports as unknown as MoveViterbiExports;
  }

  prepare(chain: SparseChain, logs: MoveViterbiLogs, obs: Int32Array, steps: MoveSteps, segment: number): { delta: Float64Array; back: Pointers } | null {
    const move = chain.move!;
    const n = chain.nCells;
    const links = chain.inIdx.length;
    const width = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
    const T = obs.length;
    const sizes: Array<[string, number]> = [
      ['logStart', 8 * n],
      ['logDwell', 8 * n],
      ['logDwellGo', 8 * n],
      ['logStay', 8 * logs.logStay.length],
      ['logGo', 8 * logs.logGo.length],
      ['elig', 4 * n],
      ['logSplitIn', 8 * logs.logSplitIn.length],
      ['inPtr', 4 * (n + 1)],
      ['inIdx', 4 * links],
      ['logEmit', 8 * logs.logEmitT.length],
      ['obs', 4 * T],
      ['dBin', 4 * T],
      ['hBin', 4 * T],
      ['delta', 16 * n],
      ['work', 16 * n],
      ['back', width * n * segment],
    ];
    const at: Record<string, number> = {};
    let offset = 0;
    for (const [name, bytes] of sizes) {
      at[name] = offset;
      offset += align(bytes);
    }
    if (!growWasmMemory(this.memory, offset)) return null;
    this.n = n;
    this.m = chain.nReadings;
    this.links = links;
    this.headingBins = move.nHeadingBins;
    this.width = width;
    this.at = at;
    const buffer = this.memory.buffer;
    const f64 = (name: string, x: Float64Array): void => new Float64Array(buffer, at[name], x.length).set(x);
    f64('logStart', logs.logStart);
    f64('logDwell', logs.logDwell);
    f64('logDwellGo', logs.logDwellGo);
    f64('logStay', logs.logStay);
    f64('logGo', logs.logGo);
    f64('logSplitIn', logs.logSplitIn);
    f64('logEmit', logs.logEmitT);
    new Int32Array(buffer, at.elig, n).set(move.eligible);
    new Int32Array(buffer, at.inPtr, n + 1).set(chain.inPtr);
    new Int32Array(buffer, at.inIdx, links).set(chain.inIdx);
    new Int32Array(buffer, at.obs, T).set(obs);
    new Int32Array(buffer, at.dBin, T).set(steps.dBin.subarray(0, T));
    new Int32Array(buffer, at.hBin, T).set(steps.hBin.subarray(0, T));
    const cells = n * segment;
    const back = width === 1 ? new Uint8Array(buffer, at.back, cells) : width === 2 ? new Uint16Array(buffer, at.back, cells) : new Int32Array(buffer, at.back, cells);
    return { delta: new Float64Array(buffer, at.delta, 2 * n), back };
  }

  /** Steps t0 … t1-1 of the prepared run. */
  run(t0: number, t1: number): void {
    const a = this.at;
    const kernel = this.width === 1 ? this.kernels.viterbi1 : this.width === 2 ? this.kernels.viterbi2 : this.kernels.viterbi4;
    kernel(this.n, this.m, t0, t1, this.links, this.headingBins, a.logStart, a.logDwell, a.logDwellGo, a.logStay, a.logGo, a.elig, a.logSplitIn, a.inPtr, a.inIdx, a.logEmit, a.obs, a.dBin, a.hBin, a.delta, a.back, a.work);
  }
}
