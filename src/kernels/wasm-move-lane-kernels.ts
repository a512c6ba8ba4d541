import { LANES, type LaneGroup, type SparseChain } from './sparse-chain.js';
import { DISTANCE_BINS, HEADING_BINS, type MoveChain } from './move-chain.js';
import type { MoveLaneGroup } from './forward-move-lanes.js';
import type { MoveLaneAccumulators } from './backward-move-lanes.js';
import { wasmModule } from './wasm-module.js';
import { growWasmMemory, newWasmMemory } from './wasm-memory.js';
import { forwardMoveLanesWasm } from './forward-move-lanes-wasm.js';
import { backwardMoveLanesWasm } from './backward-move-lanes-wasm.js';

interface MoveLaneExports {
  forward(...args: number[]): void;
  backward(...args: number[]): void;
}

let compiled: WebAssembly.Module | null | undefined;

/** The movement lane kernels' WebAssembly module, compiled once per thread; null where WebAssembly SIMD is missing. */
function moveLaneModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      compiled = new WebAssembly.Module(
        wasmModule([
          { name: 'forward', fn: forwardMoveLanesWasm() },
          { name: 'backward', fn: backwardMoveLanesWasm() },
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
 * The movement lane kernels (`forwardMoveLanes`, `backwardMoveLanes`) as WebAssembly SIMD
 * (`forwardMoveLanesWasm`, `backwardMoveLanesWasm`): the same numbers, bit for bit, as the JavaScript
 * movement lanes, which stay the reference and the fallback.
 *
 * As `WasmLaneKernels`, everything lives in this object's own linear memory, region by region: the
 * chain with its movement tables (copied in when a new chain arrives; `eligible` as 16-byte lane
 * masks), the group (emission-row addresses, lane lengths) and, per step and lane, what the odometry
 * selects — the staying probability of the distance bin with an all-ones mask where it is known, the
 * byte addresses of the heading bin's rows of `splitIn`, `splitOut` and `moveByHeading` (0 where the
 * heading is unknown: those moves are not kept), whether any lane's distance is unknown, and the bins
 * themselves (entry t for the transition into step t; entry T, past the end, unknown in every lane) —
 * then the scaling factors, ŵ vectors, scratch, the accumulators and, last, the forward table.
 * `create` returns null when the runtime refuses a memory; `prepare` returns false when it refuses to
 * grow it (the object is then unchanged), and the caller uses the JavaScript kernels.
 */
export class WasmMoveLaneKernels {
  /** True where this runtime compiles WebAssembly with 128-bit SIMD. */
  static available(): boolean {
    return typeof WebAssembly === 'object' && moveLaneModule() !== null;
  }

  /** The forward table: rows of nCells × LANES numbers, `segment + 1` rows (row 0 holds u_{t0-1}). */
  table = new Float64Array(0);
  accumulators!: MoveLaneAccumulators;
  private readonly kernels: MoveLaneExports;
  private at: Record<string, number> = {};
  private dims = { n: -1, m: -1, links: -1, steps: -1, segment: -1 };
  private chain: SparseChain | null = null;
  private lens = new Int32Array(LANES);
  private sums = new Float64Array(0);

  /** The kernels with a memory of their own, or null when the runtime refuses one (see `newWasmMemory`). */
  static create(): WasmMoveLaneKernels | null {
    const memory = newWasmMemory();
    return memory === null ? null : new WasmMoveLaneKernels(memory);
  }

  private constructor(private readonly memory: WebAssembly.Memory) {
    const module = moveLaneModule();
    if (module === null) throw new Error('WasmMoveLaneKernels: WebAssembly SIMD must be available, got a runtime without it');
    this.kernels = new WebAssembly.Instance(module, { env: { memory: this.memory } }).exports as unknown as MoveLaneExports;
  }

  /**
   * Sizes the memory for `group` (with its odometry bins `moves`, steps × LANES) processed in segments
   * of `segment` steps under `chain` (which must carry `move`), and loads them; false when the memory
   * would have to grow and the runtime refuses.
   */
  prepare(chain: SparseChain, group: LaneGroup, moves: MoveLaneGroup, segment: number): boolean {
    const move = chain.move!;
    const n = chain.nCells;
    const m = chain.nReadings;
    const links = chain.outPtr[n];
    const T = group.nSteps;
    const d = this.dims;
    if (d.n !== n || d.m !== m || d.links !== links || T > d.steps || segment > d.segment) {
      const same = d.n === n && d.m === m && d.links === links;
      if (!this.layout(n, m, links, Math.max(T, same ? d.steps : 0), Math.max(segment, same ? d.segment : 0))) return false;
    }
    if (this.chain !== chain) this.loadChain(chain, move);
    const buffer = this.memory.buffer;
    const a = this.at;
    const rows = new Int32Array(buffer, a.rows, T * LANES);
    for (let x = 0; x < T * LANES; x++) rows[x] = a.emit + 8 * group.rows[x];
    this.lens.set(group.laneSteps);
    new Int32Array(buffer, a.lens, LANES).set(group.laneSteps);
    const stay = new Float64Array(buffer, a.stay, (T + 1) * LANES);
    const known = new Int32Array(buffer, a.known, 2 * (T + 1) * LANES);
    const splitInAt = new Int32Array(buffer, a.splitInAt, (T + 1) * LANES);
    const splitOutAt = new Int32Array(buffer, a.splitOutAt, (T + 1) * LANES);
    const headAt = new Int32Array(buffer, a.headAt, (T + 1) * LANES);
    const dBin = new Int32Array(buffer, a.dBin, (T + 1) * LANES);
    const hBin = new Int32Array(buffer, a.hBin, (T + 1) * LANES);
    const H = move.nHeadingBins;
    const anyUnknown = new Int32Array(buffer, a.anyUnknown, T + 1).fill(0);
    for (let x = 0; x < (T + 1) * LANES; x++) {
      const db = x < T * LANES ? moves.dBin[x] : -1;
      const hb = x < T * LANES ? moves.hBin[x] : -1;
      const row = hb < 0 ? H : hb;
      stay[x] = db >= 0 ? move.stayByDistance[db] : 0;
      known[2 * x] = known[2 * x + 1] = db >= 0 ? -1 : 0;
      splitInAt[x] = a.splitIn + 8 * row * links;
      splitOutAt[x] = a.splitOut + 8 * row * links;
      headAt[x] = hb < 0 ? 0 : a.moveByHeading + 8 * row * n;
      dBin[x] = db;
      if (db < 0) anyUnknown[Math.floor(x / LANES)] = 1;
      hBin[x] = hb;
    }
    return true;
  }

  /** `forwardMoveLanes` over steps `t0 … t1-1`, adding each lane's log-likelihood into `logOut`. */
  forward(t0: number, t1: number, logOut: Float64Array): void {
    const a = this.at;
    this.kernels.forward(this.dims.n, t0, t1, a.start, a.dwell, a.inPtr, a.inIdx, a.rows, a.table, a.scale, a.sums, a.elig, a.stay, a.known, a.splitInAt, a.work);
    const sums = this.sums;
    const lens = this.lens;
    for (let t = t0; t < t1; t++) {
      for (let k = 0; k < LANES; k++) {
        if (t < lens[k]) {
          const s = sums[t * LANES + k];
          logOut[k] += s > 0 ? Math.log(s) : -Infinity;
        }
      }
    }
  }

  /** Zeroes the carried ŵ before the last segment. */
  resetBackward(): void {
    new Float64Array(this.memory.buffer, this.at.w, LANES * this.dims.n).fill(0);
  }

  /** `backwardMoveLanes` over steps `t1-1 … t0`, adding into `accumulators`. */
  backward(t0: number, t1: number): void {
    const a = this.at;
    this.kernels.backward(
      this.dims.n, t0, t1, a.dwell, a.outPtr, a.outIdx, a.emit, a.rows, a.lens, a.table, a.scale, a.w, a.wSpare, a.emitCount, a.startCount,
      a.dwellCount, a.moveCount, a.elig, a.stay, a.known, a.splitOutAt, a.headAt, a.dBin, a.hBin, a.stayByDistance, a.moveByDistance,
      a.headingCos, a.headingSin, a.linkCos, a.linkSin, a.anyUnknown,
    );
  }

  private layout(n: number, m: number, links: number, steps: number, segment: number): boolean {
    const H1 = HEADING_BINS + 1; // heading bins and the plain row
    const D = DISTANCE_BINS;
    const sizes: Array<[string, number]> = [
      ['start', 8 * n],
      ['dwell', 8 * n],
      ['elig', 16 * n],
      ['inPtr', 4 * (n + 1)],
      ['inIdx', 4 * links],
      ['outPtr', 4 * (n + 1)],
      ['outIdx', 4 * links],
      ['linkCos', 8 * links],
      ['linkSin', 8 * links],
      ['splitIn', 8 * H1 * links],
      ['splitOut', 8 * H1 * links],
      ['emit', 8 * (m + 1) * n],
      ['lens', 4 * LANES],
      ['rows', 4 * LANES * steps],
      ['stay', 8 * LANES * (steps + 1)],
      ['known', 8 * LANES * (steps + 1)],
      ['splitInAt', 4 * LANES * (steps + 1)],
      ['splitOutAt', 4 * LANES * (steps + 1)],
      ['headAt', 4 * LANES * (steps + 1)],
      ['dBin', 4 * LANES * (steps + 1)],
      ['anyUnknown', 4 * (steps + 1)],
      ['hBin', 4 * LANES * (steps + 1)],
      ['scale', 8 * LANES * steps],
      ['sums', 8 * LANES * steps],
      ['w', 8 * LANES * n],
      ['wSpare', 8 * LANES * n],
      ['work', 16 * LANES * n],
      ['emitCount', 8 * (m + 1) * n],
      ['startCount', 8 * n],
      ['dwellCount', 8 * n],
      ['moveCount', 8 * n],
      ['stayByDistance', 8 * D],
      ['moveByDistance', 8 * D],
      ['moveByHeading', 8 * H1 * n],
      ['headingCos', 8 * H1],
      ['headingSin', 8 * H1],
      ['table', 8 * LANES * n * (segment + 1)],
    ];
    const at: Record<string, number> = {};
    let offset = 0;
    for (const [name, bytes] of sizes) {
      at[name] = offset;
      offset += align(bytes);
    }
    if (!growWasmMemory(this.memory, offset)) return false;
    this.at = at;
    this.dims = { n, m, links, steps, segment };
    const buffer = this.memory.buffer;
    const f64 = (name: string, length: number): Float64Array => new Float64Array(buffer, at[name], length).fill(0);
    this.table = new Float64Array(buffer, at.table, LANES * n * (segment + 1));
    this.sums = new Float64Array(buffer, at.sums, LANES * steps);
    this.accumulators = {
      emitCount: f64('emitCount', (m + 1) * n),
      startCount: f64('startCount', n),
      dwellCount: f64('dwellCount', n),
      moveCount: f64('moveCount', n),
      stayByDistance: f64('stayByDistance', D),
      moveByDistance: f64('moveByDistance', D),
      moveByHeading: f64('moveByHeading', H1 * n),
      headingCos: f64('headingCos', H1),
      headingSin: f64('headingSin', H1),
    };
    this.chain = null;
    return true;
  }

  private loadChain(chain: SparseChain, move: MoveChain): void {
    const buffer = this.memory.buffer;
    const at = this.at;
    const n = chain.nCells;
    if (move.nHeadingBins !== HEADING_BINS || move.stayByDistance.length !== DISTANCE_BINS) {
      throw new RangeError(`WasmMoveLaneKernels: a movement chain must have ${HEADING_BINS} heading bins and ${DISTANCE_BINS} distance bins, got ${move.nHeadingBins} and ${move.stayByDistance.length}`);
    }
    new Float64Array(buffer, at.start, n).set(chain.start);
    new Float64Array(buffer, at.dwell, n).set(chain.dwell);
    const elig = new Int32Array(buffer, at.elig, 4 * n);
    for (let i = 0; i < n; i++) elig.fill(move.eligible[i] === 1 ? -1 : 0, 4 * i, 4 * i + 4);
    new Int32Array(buffer, at.inPtr, n + 1).set(chain.inPtr);
    new Int32Array(buffer, at.inIdx, chain.inIdx.length).set(chain.inIdx);
    new Int32Array(buffer, at.outPtr, n + 1).set(chain.outPtr);
    new Int32Array(buffer, at.outIdx, chain.outIdx.length).set(chain.outIdx);
    new Float64Array(buffer, at.linkCos, move.linkCos.length).set(move.linkCos);
    new Float64Array(buffer, at.linkSin, move.linkSin.length).set(move.linkSin);
    new Float64Array(buffer, at.splitIn, move.splitIn.length).set(move.splitIn);
    new Float64Array(buffer, at.splitOut, move.splitOut.length).set(move.splitOut);
    new Float64Array(buffer, at.emit, chain.emitT.length).set(chain.emitT);
    this.chain = chain;
  }
}
