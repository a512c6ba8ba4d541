import { wasmMemoryRefused } from '../kernels/wasm-memory.js';

/**
 * The warning for a command during which the runtime refused the WebAssembly kernels their memory (so
 * the JavaScript kernels ran: the same results, a slower E-step), or none. The usual cause is an
 * address-space limit (`ulimit -v`) below what V8 sets aside per WebAssembly memory.
 */
export function wasmFallbackWarning(): string[] {
  if (!wasmMemoryRefused()) return [];
  return [
    'WebAssembly memory could not be had (an address-space limit such as ulimit -v?): the JavaScript kernels ran instead ' +
      '(same results, slower); NODE_OPTIONS=--disable-wasm-trap-handler (Node 20.15 or later) lets WebAssembly run under such a limit',
  ];
}
