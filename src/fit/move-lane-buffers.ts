import type { MoveLaneGroup } from '../kernels/forward-move-lanes.js';
import type { MoveLaneAccumulators } from '../kernels/backward-move-lanes.js';
import type { WasmMoveLaneKernels } from '../kernels/wasm-move-lane-kernels.js';

/** Buffers of the movement lane kernels, grown on demand and never shrunk (one set per workspace). */
export class MoveLaneBuffers {
  /** The WebAssembly movement lane kernels (own memory), made on first use; null when the runtime refused a memory. */
  wasm: WasmMoveLaneKernels | null | undefined = undefined;
  table: Float64Array = new Float64Array(0);
  scale: Float64Array = new Float64Array(0);
  w: Float64Array = new Float64Array(0);
  wSpare: Float64Array = new Float64Array(0);
  work: Float64Array = new Float64Array(0);
  moves: MoveLaneGroup = { dBin: new Int32Array(0), hBin: new Int32Array(0) };
  acc: MoveLaneAccumulators = {
    emitCount: new Float64Array(0),
    startCount: new Float64Array(0),
    dwellCount: new Float64Array(0),
    moveCount: new Float64Array(0),
    stayByDistance: new Float64Array(0),
    moveByDistance: new Float64Array(0),
    moveByHeading: new Float64Array(0),
    headingCos: new Float64Array(0),
    headingSin: new Float64Array(0),
  };
}
