import { LANES, type SparseChain } from '../kernels/sparse-chain.js';
import { fillLaneGroup } from '../kernels/fill-lane-group.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { DecodeLaneKernels } from '../kernels/decode-lane-kernels.js';
import { JsDecodeLanes } from '../kernels/js-decode-lanes.js';
import { WasmDecodeLanes } from '../kernels/wasm-decode-lanes.js';
import type { LaneTables } from './log-lanes.js';
import { decodeWith } from './decode-with.js';
import { plainTransitions } from './plain-transitions.js';
import { traceViterbi } from './trace-viterbi.js';
import { DEFAULT_PLAIN_LIMIT_BYTES, emptyDecodedRun, type DecodedRun, type DecodeOptions } from './decoded-run.js';

/**
 * Which kernels `decodeLanes` runs: the WebAssembly lanes where it can (the default; where it cannot, each
 * run through `decodeRun`'s path), or with `useWasm: false` the JavaScript lanes (the reference).
 */
export interface LaneDecodeOptions extends DecodeOptions {
  /** @default true */
  useWasm?: boolean;
  /**
   * Only the Viterbi paths and their log-probabilities (`viterbiPath`'s work); the other outputs stay
   * as for an impossible run (NaN / −1) and `logLik` is 0. @default false
   */
  viterbiOnly?: boolean;
  /**
   * A group longer than this many steps is decoded one run at a time (the same numbers): side by side,
   * eight runs' outputs and per-step tables are held at once, about 250 bytes per step of the group.
   * @default 262144
   */
  laneStepsLimit?: number;
}

const DEFAULT_LANE_STEPS_LIMIT = 1 << 18;

/** One WebAssembly decoder per thread, reused (its memory grows to the largest group seen); null where unavailable. */
let wasm: WasmDecodeLanes | null | undefined;
let js: JsDecodeLanes | undefined;

/**
 * Decodes up to eight runs side by side (one lane group): for each, exactly what `decodeRun` gives for
 * it alone — the same numbers, bit for bit (tested) — with every transition loaded once for eight runs
 * (`viterbiLanes`, `forwardLanes`, `posteriorSummaryLanes`, as WebAssembly SIMD where available). Runs
 * may differ in length (the group is as long as its longest run; group runs of similar length to waste
 * little). Long groups are checkpointed as `decodeRun` does, with `plainLimitBytes` applying to the
 * group's tables. A group of one run, or longer than `laneStepsLimit`, and every group where the
 * WebAssembly kernels or their memory are missing, is decoded one run at a time (`decodeRun`'s path,
 * the faster one there). `lanes` is `logLanes(chain, log)`.
 */
export function decodeLanes(chain: SparseChain, lanes: LaneTables, runs: ReadonlyArray<Int32Array>, options: LaneDecodeOptions = {}): DecodedRun[] {
  if (runs.length > LANES) throw new RangeError(`decodeLanes: a group must hold at most ${LANES} runs, got ${runs.length}`);
  const limit = options.plainLimitBytes ?? DEFAULT_PLAIN_LIMIT_BYTES;
  const n = chain.nCells;
  const positions = options.positions ?? null;
  const group = fillLaneGroup(runs, n, chain.nReadings);
  const nSteps = group.nSteps;
  const lens = group.laneSteps;
  const row = LANES * n;
  const pointerBytes = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
  const vSegment = segmentSteps(nSteps, row * pointerBytes, limit);
  const segment = options.viterbiOnly ? 1 : segmentSteps(nSteps, 8 * row, limit);

  let kernels: DecodeLaneKernels | null = null;
  // A lone run costs the same work in lanes as eight (the idle lanes compute too): alone it goes faster.
  const alone = options.useWasm !== false && (runs.filter((obs) => obs.length > 0).length < 2 || nSteps > (options.laneStepsLimit ?? DEFAULT_LANE_STEPS_LIMIT));
  if (options.useWasm !== false && !alone) {
    if (wasm === undefined) wasm = WasmDecodeLanes.available() ? WasmDecodeLanes.create() : null;
    if (wasm?.prepare(chain, lanes, group, vSegment, segment, positions)) kernels = wasm;
  }
  const results: DecodedRun[] = runs.map((obs) => emptyDecodedRun(obs.length, positions !== null));
  if (nSteps === 0) return results;
  if (kernels === null && options.useWasm !== false) {
    // Without WebAssembly (or its memory) the one-run decoder is the faster of the two JavaScript paths
    // (the JavaScript lanes are the WebAssembly kernels' reference), and a lone or very long run goes
    // alone: the same numbers either way.
    if (!options.viterbiOnly) return runs.map((obs) => decodeWith(plainTransitions(chain, lanes.log, obs), obs, options));
    runs.forEach((obs, k) => {
      results[k].pathLogProb = traceViterbi(plainTransitions(chain, lanes.log, obs), obs.length, limit, results[k].path);
    });
    return results;
  }
  if (kernels === null) {
    js ??= new JsDecodeLanes();
    js.prepare(chain, lanes, group, vSegment, segment, positions);
    kernels = js;
  }

  // Viterbi: forward over the segments (keeping δ at each segment's entry), then the trace-back.
  const nV = Math.ceil(nSteps / vSegment);
  const vCheck = new Float64Array(nV > 1 ? nV * row : 0);
  for (let g = 0; g < nV; g++) {
    if (g > 0) vCheck.set(kernels.delta.subarray(0, row), g * row);
    kernels.viterbi(g * vSegment, Math.min(nSteps, (g + 1) * vSegment));
  }
  const cellOf = new Int32Array(LANES).fill(-1);
  for (let k = 0; k < runs.length; k++) {
    const T = lens[k];
    if (T === 0) continue;
    const last = kernels.last;
    let cell = 0;
    let best = last[k];
    for (let j = 1; j < n; j++) {
      if (last[8 * j + k] > best) {
        best = last[8 * j + k];
        cell = j;
      }
    }
    if (best === -Infinity || Number.isNaN(best)) {
      results[k].path.fill(-1);
      results[k].pathLogProb = -Infinity;
      continue;
    }
    results[k].pathLogProb = best;
    results[k].path[T - 1] = cell;
    cellOf[k] = cell;
  }
  for (let g = nV - 1; g >= 0; g--) {
    const a = g * vSegment;
    const b = Math.min(nSteps, a + vSegment);
    if (g < nV - 1) {
      if (g > 0) kernels.delta.set(vCheck.subarray(g * row, (g + 1) * row), 0);
      kernels.viterbi(a, b);
    }
    const back = kernels.back;
    for (let k = 0; k < runs.length; k++) {
      let cell = cellOf[k];
      if (cell < 0) continue;
      const path = results[k].path;
      for (let t = Math.min(b, lens[k]) - 1; t >= Math.max(a, 1); t--) {
        cell = back[((t - a) * n + cell) * 8 + k];
        path[t - 1] = cell;
      }
      cellOf[k] = cell;
    }
  }

  if (options.viterbiOnly) return results;

  // Forward, keeping the entry rows of every segment when checkpointed.
  const nF = Math.ceil(nSteps / segment);
  const fCheck = new Float64Array(nF > 1 ? nF * row : 0);
  const logOut = new Float64Array(LANES);
  for (let g = 0; g < nF; g++) {
    if (g > 0) {
      kernels.table.copyWithin(0, segment * row, (segment + 1) * row);
      fCheck.set(kernels.table.subarray(0, row), g * row);
    }
    kernels.forward(g * segment, Math.min(nSteps, (g + 1) * segment), logOut);
  }
  let alive = false;
  for (let k = 0; k < runs.length; k++) {
    results[k].logLik = logOut[k];
    if (lens[k] > 0 && logOut[k] !== -Infinity) alive = true;
  }
  if (!alive) return results;

  // Backward with the summaries, last segment first, earlier ones recomputed from their checkpoints.
  const spare = new Float64Array(LANES);
  kernels.resetBackward();
  for (let g = nF - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(nSteps, a + segment);
    if (g < nF - 1) {
      if (g > 0) kernels.table.set(fCheck.subarray(g * row, (g + 1) * row), 0);
      kernels.forward(a, b, spare);
    }
    const pathIn = kernels.path;
    for (let t = a; t < b; t++) {
      for (let k = 0; k < LANES; k++) pathIn[(t - a) * 8 + k] = k < runs.length && t < lens[k] ? results[k].path[t] : 0;
    }
    kernels.summary(a, b);
    const o = kernels.out;
    for (let k = 0; k < runs.length; k++) {
      const r = results[k];
      if (r.logLik === -Infinity) continue;
      const pos = r.positions;
      for (let t = a; t < Math.min(b, lens[k]); t++) {
        const x = (t - a) * 8 + k;
        r.likelyCell[t] = o.likelyCell[x];
        r.likelyP[t] = o.likelyP[x];
        r.pathP[t] = o.pathP[x];
        r.entropyBits[t] = o.entropyBits[x];
        if (pos) {
          pos.likelyZone[t] = o.likelyZone[x];
          pos.zoneP[t] = o.zoneP[x];
          pos.meanLevel[t] = o.meanLevel[x];
          pos.meanX[t] = o.meanX[x];
          pos.meanY[t] = o.meanY[x];
          pos.spreadM[t] = o.spreadM[x];
        }
      }
    }
  }
  const scale = kernels.scale;
  for (let k = 0; k < runs.length; k++) {
    const r = results[k];
    if (r.logLik === -Infinity) continue;
    const obs = runs[k];
    for (let t = 0; t < obs.length; t++) if (obs[t] >= 0) r.surpriseBits[t] = Math.log2(scale[t * 8 + k]);
  }
  return results;
}
