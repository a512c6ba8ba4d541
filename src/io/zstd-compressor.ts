import { WorkError } from '../errors.js';

/** A zstd compressor: bytes in, one zstd frame (RFC 8878) out. */
export type ZstdCompress = (data: Uint8Array) => Uint8Array;

/**
 * zstd level used for every compressed output. Level 1 measured 1.4× faster than level 3 with a ratio
 * within 2 % on annotated-table buffers (DEVELOPERS.md, "Compressed outputs").
 */
export const ZSTD_LEVEL = 1;

let loaded: Promise<ZstdCompress> | null = null;

/**
 * Loads the zstd compressor (@bokuweb/zstd-wasm, zstd built for WebAssembly) once and returns it. Loaded
 * only when a compressed table is written (start-up time). Fails with a WorkError when WebAssembly memory
 * cannot be had (e.g. under a small `ulimit -v`).
 */
export function loadZstdCompressor(): Promise<ZstdCompress> {
  loaded ??= (async () => {
    try {
      const zstd = await import('@bokuweb/zstd-wasm');
      await zstd.init();
      return (data: Uint8Array) => zstd.compress(data, ZSTD_LEVEL);
    } catch (err) {
      loaded = null;
      throw new WorkError(`zstd compressor: WebAssembly module must load, got ${String((err as Error).message ?? err).replace(/\s+/g, ' ')}`);
    }
  })();
  return loaded;
}
