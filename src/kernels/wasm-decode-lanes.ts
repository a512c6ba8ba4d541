import { LANES, type LaneGroup, type SparseChain } from './sparse-chain.js';
import type { DecodeLaneKernels, LogLanes } from './decode-lane-kernels.js';
import type { LaneSummaries } from './posterior-summary-lanes.js';
import type { PositionGroups } from './position-summary.js';
import { wasmModule } from './wasm-module.js';
import { growWasmMemory, newWasmMemory } from './wasm-memory.js';
import { forwardLanesWasm } from './forward-lanes-wasm.js';
import { viterbiLanesWasm } from './viterbi-lanes-wasm.js';
import { posteriorSummaryLanesWasm } from './posterior-summary-lanes-wasm.js';

type Kernel = (...args: number[]) => void;
interface DecodeExports {
  forward: Kernel;
  viterbi1: Kernel;
  viterbi2: Kernel;
  viterbi4: Kernel;
  summary: Kernel;
  summaryPositions: Kernel;
}

let compiled: WebAssembly.Module | null | undefined;

/** The decode module, compiled once per thread; null where WebAssembly SIMD is missing. */
function decodeModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      compiled = new WebAssembly.Module(
        wasmModule([
          { name: 'forward', fn: forwardLanesWasm() },
          { name: 'viterbi1', fn: viterbiLanesWasm(1) },
          { name: 'viterbi2', fn: viterbiLanesWasm(2) },
          { name: 'viterbi4', fn: viterbiLanesWasm(4) },
          { name: 'summary', fn: posteriorSummaryLanesWasm(false) },
          { name: 'summaryPositions', fn: posteriorSummaryLanesWasm(true) },
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
 * The lane decode kernels as WebAssembly SIMD (`viterbiLanesWasm`, `forwardLanesWasm`,
 * `posteriorSummaryLanesWasm`) behind `DecodeLaneKernels`: the same numbers as `JsDecodeLanes`, bit for
 * bit. Everything lives in this object's own linear memory, laid out afresh by each `prepare` (chain,
 * log tables, position groups, the group's rows, then the buffers); it starts at one page, grows when a
 * larger group arrives and never shrinks. The chain is copied in only when a new chain (or a new
 * layout) arrives. `create` returns null when the runtime refuses a memory, `prepare` false when it
 * refuses to grow it (the caller then uses `JsDecodeLanes`).
 */
export class WasmDecodeLanes implements DecodeLaneKernels {
  static available(): boolean {
    return typeof WebAssembly === 'object' && decodeModule() !== null;
  }

  static create(): WasmDecodeLanes | null {
    const memory = newWasmMemory();
    return memory === null ? null : new WasmDecodeLanes(memory);
  }

  delta: Float64Array = new Float64Array(0);
  back: Uint8Array | Uint16Array | Int32Array = new Uint8Array(0);
  last: Float64Array = new Float64Array(0);
  table: Float64Array = new Float64Array(0);
  scale: Float64Array = new Float64Array(0);
  path: Int32Array = new Int32Array(0);
  out!: LaneSummaries;
  private readonly kernels: DecodeExports;
  private at: Record<string, number> = {};
  private n = 0;
  private width: 1 | 2 | 4 = 1;
  private positions: PositionGroups | null = null;
  /** True when every area is one cell, area i = cell i (a floor without zones). */
  private cellAreas = false;
  private sums: Float64Array = new Float64Array(0);
  private lens = new Int32Array(LANES);
  private key = '';
  private loaded: { chain: SparseChain; log: LogLanes; positions: PositionGroups | null } | null = null;

  private constructor(private readonly memory: WebAssembly.Memory) {
    const module = decodeModule();
    if (module === null) throw new Error('WasmDecodeLanes: WebAssembly SIMD must be available, got a runtime without it');
    this.kernels = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as DecodeExports;
  }

  prepare(chain: SparseChain, log: LogLanes, group: LaneGroup, viterbiSegment: number, segment: number, positions: PositionGroups | null): boolean {
    const n = chain.nCells;
    const m = chain.nReadings;
    const links = chain.inIdx.length;
    const steps = group.nSteps;
    const width = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
    const nZones = positions ? positions.nZones : 0;
    const nLevels = positions ? positions.nLevels : 0;
    const row = LANES * n;
    const sizes: Array<[string, number]> = [
      ['start', 8 * n],
      ['dwell', 8 * n],
      ['inPtr', 4 * (n + 1)],
      ['inIdx', 4 * links],
      ['inSplit', 4 * n],
      ['inProb', 8 * links],
      ['outPtr', 4 * (n + 1)],
      ['outIdx', 4 * links],
      ['outProb', 8 * links],
      ['emit', 8 * (m + 1) * n],
      ['logStart', 8 * n],
      ['logDwell', 8 * n],
      ['logInProb', 8 * links],
      ['logEmit', 8 * (m + 1) * n],
      ['zoneOf', 4 * n],
      ['levelOf', 4 * n],
      ['dx', 8 * n],
      ['dy', 8 * n],
      ['r2', 8 * n],
      ['originX', 8 * nLevels],
      ['originY', 8 * nLevels],
      ['work', 8 * LANES * (nZones + 4 * nLevels)],
      ['lens', 4 * LANES],
      ['rows', 4 * LANES * steps],
      ['scale', 8 * LANES * steps],
      ['sums', 8 * LANES * steps],
      ['delta', 16 * row],
      ['last', 8 * row],
      ['w', 8 * row],
      ['wSpare', 8 * row],
      ['gamma', 8 * row],
      ['path', 4 * LANES * segment],
      ['likelyCell', 4 * LANES * segment],
      ['likelyP', 8 * LANES * segment],
      ['pathP', 8 * LANES * segment],
      ['entropy', 8 * LANES * segment],
      ['likelyZone', 4 * LANES * segment],
      ['zoneP', 8 * LANES * segment],
      ['meanLevel', 4 * LANES * segment],
      ['meanX', 8 * LANES * segment],
      ['meanY', 8 * LANES * segment],
      ['spread', 8 * LANES * segment],
      ['back', width * row * viterbiSegment],
      ['table', 8 * row * (segment + 1)],
    ];
    // A leading pad, so that the masked read of γ at a path cell of −1 stays inside the memory.
    const at: Record<string, number> = {};
    let offset = 64;
    for (const [name, bytes] of sizes) {
      at[name] = offset;
      offset += align(bytes);
    }
    if (!growWasmMemory(this.memory, offset)) return false;
    const key = sizes.map(([name]) => at[name]).join(',');
    const buffer = this.memory.buffer;
    const f64 = (name: string, length: number): Float64Array => new Float64Array(buffer, at[name], length);
    const i32 = (name: string, length: number): Int32Array => new Int32Array(buffer, at[name], length);
    this.at = at;
    this.n = n;
    this.width = width;
    this.positions = positions;
    this.cellAreas = positions !== null && positions.nZones === n && positions.zoneOf.every((z, i) => z === i);
    const reload = key !== this.key || this.loaded?.chain !== chain || this.loaded?.log !== log || this.loaded?.positions !== positions;
    this.key = key;
    if (reload) {
      f64('start', n).set(chain.start);
      f64('dwell', n).set(chain.dwell);
      i32('inPtr', n + 1).set(chain.inPtr);
      i32('inIdx', links).set(chain.inIdx);
      i32('inSplit', n).set(log.inSplit);
      f64('inProb', links).set(chain.inProb);
      i32('outPtr', n + 1).set(chain.outPtr);
      i32('outIdx', links).set(chain.outIdx);
      f64('outProb', links).set(chain.outProb);
      f64('emit', (m + 1) * n).set(chain.emitT);
      f64('logStart', n).set(log.logStart);
      f64('logDwell', n).set(log.logDwell);
      f64('logInProb', links).set(log.logInProb);
      f64('logEmit', (m + 1) * n).set(log.logEmitT);
      if (positions) {
        i32('zoneOf', n).set(positions.zoneOf);
        i32('levelOf', n).set(positions.levelOf);
        f64('dx', n).set(positions.dx);
        f64('dy', n).set(positions.dy);
        const r2 = f64('r2', n);
        for (let i = 0; i < n; i++) r2[i] = positions.dx[i] * positions.dx[i] + positions.dy[i] * positions.dy[i];
        f64('originX', nLevels).set(positions.originX);
        f64('originY', nLevels).set(positions.originY);
      }
      this.loaded = { chain, log, positions };
    }
    const rows = i32('rows', steps * LANES);
    for (let x = 0; x < steps * LANES; x++) rows[x] = at.emit + 8 * group.rows[x];
    i32('lens', LANES).set(group.laneSteps);
    this.lens.set(group.laneSteps);
    this.delta = f64('delta', 2 * row);
    this.last = f64('last', row);
    const cells = row * viterbiSegment;
    this.back = width === 1 ? new Uint8Array(buffer, at.back, cells) : width === 2 ? new Uint16Array(buffer, at.back, cells) : new Int32Array(buffer, at.back, cells);
    this.table = f64('table', row * (segment + 1));
    this.scale = f64('scale', LANES * steps);
    this.sums = f64('sums', LANES * steps);
    this.path = i32('path', LANES * segment);
    const s = LANES * segment;
    const p = positions ? s : 0;
    this.out = {
      likelyCell: i32('likelyCell', s),
      likelyP: f64('likelyP', s),
      pathP: f64('pathP', s),
      entropyBits: f64('entropy', s),
      likelyZone: i32('likelyZone', p),
      zoneP: f64('zoneP', p),
      meanLevel: i32('meanLevel', p),
      meanX: f64('meanX', p),
      meanY: f64('meanY', p),
      spreadM: f64('spread', p),
    };
    return true;
  }

  viterbi(t0: number, t1: number): void {
    const a = this.at;
    const kernel = this.width === 1 ? this.kernels.viterbi1 : this.width === 2 ? this.kernels.viterbi2 : this.kernels.viterbi4;
    kernel(this.n, t0, t1, a.logStart, a.logDwell, a.inPtr, a.inIdx, a.inSplit, a.logInProb, a.rows, a.logEmit - a.emit, a.lens, a.delta, a.back, a.last);
  }

  forward(t0: number, t1: number, logOut: Float64Array): void {
    const a = this.at;
    this.kernels.forward(this.n, t0, t1, a.start, a.dwell, a.inPtr, a.inIdx, a.inProb, a.rows, a.table, a.scale, a.sums);
    // log Σ_j u_t(j) for the lanes still inside their run, as `forwardLanes` adds it.
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

  resetBackward(): void {
    new Float64Array(this.memory.buffer, this.at.w, LANES * this.n).fill(0);
  }

  summary(t0: number, t1: number): void {
    const a = this.at;
    const p = this.positions;
    const kernel = p ? this.kernels.summaryPositions : this.kernels.summary;
    kernel(
      this.n, t0, t1, a.dwell, a.outPtr, a.outIdx, a.outProb, a.rows, a.lens, a.table, a.scale, a.w, a.wSpare, a.gamma, a.path,
      a.likelyCell, a.likelyP, a.pathP, a.entropy,
      p ? p.nZones : 0, this.cellAreas ? 1 : 0, p ? p.nLevels : 0, a.zoneOf, a.levelOf, a.dx, a.dy, a.r2, a.originX, a.originY, a.work,
      a.likelyZone, a.zoneP, a.meanLevel, a.meanX, a.meanY, a.spread,
    );
  }
}
