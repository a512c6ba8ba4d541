import type { SparseChain } from './sparse-chain.js';
import { wasmModule } from './wasm-module.js';
import { viterbiSegmentWasm } from './viterbi-segment-wasm.js';
import { growWasmMemory, newWasmMemory } from './wasm-memory.js';

type Pointers = Uint8Array | Uint16Array | Int32Array;
interface ViterbiExports {
  viterbi1(...args: number[]): void;
  viterbi2(...args: number[]): void;
  viterbi4(...args: number[]): void;
}

let compiled: WebAssembly.Module | null | undefined;

function viterbiModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      compiled = new WebAssembly.Module(
        wasmModule([
          { name: 'viterbi1', fn: viterbiSegmentWasm(1) },
          { name: 'viterbi2', fn: viterbiSegmentWasm(2) },
          { name: 'viterbi4', fn: viterbiSegmentWasm(4) },
        ]),
      );
    } catch {
      compiled = null;
    }
  }
  return compiled;
}

const align = (bytes: number): number => Math.ceil(bytes / 16) * 16;

/**
 * `viterbiSegment` as WebAssembly (`viterbiSegmentWasm`) for one run at a time: the same scores and
 * back-pointers, with the argmax taken by `select` rather than a branch. `prepare` lays out this object's
 * linear memory for the chain (log-probabilities), the run's readings and a segment of `segment` rows
 * of back-pointers in the narrowest integer type for the cell count, and returns views on the score
 * vectors (`delta`, 2 · nCells: δ_{t0-1} in the first half before `run`, δ_{t1-1} after) and on the
 * back-pointers (row t - t0 for step t), valid until the next `prepare`. The memory starts at one page
 * and grows when needed; `create` returns null when the runtime refuses a memory and `prepare` returns
 * null when it refuses to grow it (the caller then runs `viterbiSegment` in JavaScript).
 */
export class WasmViterbi {
  /** True where this runtime compiles the module. */
  static available(): boolean {
    return typeof WebAssembly === 'object' && viterbiModule() !== null;
  }

  private readonly kernels: ViterbiExports;
  private at: Record<string, number> = {};
  private n = 0;
  private m = 0;
  private width: 1 | 2 | 4 = 1;

  /** The kernel with a memory of its own, or null when the runtime refuses one (see `newWasmMemory`). */
  static create(): WasmViterbi | null {
    const memory = newWasmMemory();
    return memory === null ? null : new WasmViterbi(memory);
  }

  private constructor(private readonly memory: WebAssembly.Memory) {
    const module = viterbiModule();
    if (module === null) throw new Error('WasmViterbi: WebAssembly must be available, got a runtime without it');
    this.kernels = new WebAssembly.Instance(module, { env: { memory: this.memory } }).exports as unknown as ViterbiExports;
  }

  prepare(
    chain: SparseChain,
    logStart: Float64Array,
    logDwell: Float64Array,
    logInProb: Float64Array,
    logEmitT: Float64Array,
    obs: Int32Array,
    segment: number,
  ): { delta: Float64Array; back: Pointers } | null {
    const n = chain.nCells;
    const links = chain.inIdx.length;
    const width = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
    const sizes: Array<[string, number]> = [
      ['logStart', 8 * n],
      ['logDwell', 8 * n],
      ['inPtr', 4 * (n + 1)],
      ['inIdx', 4 * links],
      ['logInProb', 8 * links],
      ['logEmit', 8 * logEmitT.length],
      ['obs', 4 * obs.length],
      ['delta', 16 * n],
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
    this.width = width;
    this.at = at;
    const buffer = this.memory.buffer;
    new Float64Array(buffer, at.logStart, n).set(logStart);
    new Float64Array(buffer, at.logDwell, n).set(logDwell);
    new Int32Array(buffer, at.inPtr, n + 1).set(chain.inPtr);
    new Int32Array(buffer, at.inIdx, links).set(chain.inIdx);
    new Float64Array(buffer, at.logInProb, links).set(logInProb);
    new Float64Array(buffer, at.logEmit, logEmitT.length).set(logEmitT);
    new Int32Array(buffer, at.obs, obs.length).set(obs);
    const cells = n * segment;
    const back = this.width === 1 ? new Uint8Array(buffer, at.back, cells) : this.width === 2 ? new Uint16Array(buffer, at.back, cells) : new Int32Array(buffer, at.back, cells);
    return { delta: new Float64Array(buffer, at.delta, 2 * n), back };
  }

  /** Steps t0 … t1-1 of the prepared run. */
  run(t0: number, t1: number): void {
    const a = this.at;
    const kernel = this.width === 1 ? this.kernels.viterbi1 : this.width === 2 ? this.kernels.viterbi2 : this.kernels.viterbi4;
    kernel(this.n, this.m, t0, t1, a.logStart, a.logDwell, a.inPtr, a.inIdx, a.logInProb, a.logEmit, a.obs, a.delta, a.back);
  }
}
