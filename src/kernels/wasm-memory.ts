/** Bytes in one WebAssembly page. */
export const WASM_PAGE = 65536;

let refused = false;

/**
 * A linear memory for the WebAssembly kernels, one page to start with (grown by `growWasmMemory` as the
 * work needs), or null when the runtime refuses it. No maximum is given: it would not lower what the
 * runtime sets aside. Where WebAssembly bounds checks rely on guard pages (V8 on 64-bit machines), every
 * memory sets aside about 10 GB of address space, whatever its size, so under an address-space limit
 * (`ulimit -v`) a memory cannot be had at all; callers then use the JavaScript kernels (same numbers).
 */
export function newWasmMemory(): WebAssembly.Memory | null {
  try {
    return new WebAssembly.Memory({ initial: 1 });
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    refused = true;
    return null;
  }
}

/** Grows `memory` to hold at least `bytes`; false (memory unchanged) when the runtime refuses. */
export function growWasmMemory(memory: WebAssembly.Memory, bytes: number): boolean {
  const pages = Math.ceil(bytes / WASM_PAGE);
  const have = memory.buffer.byteLength / WASM_PAGE;
  if (pages <= have) return true;
  try {
    memory.grow(pages - have);
    return true;
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    refused = true;
    return false;
  }
}

/** True once this thread has been refused a WebAssembly memory or its growth (the JavaScript kernels ran instead). */
export function wasmMemoryRefused(): boolean {
  return refused;
}
