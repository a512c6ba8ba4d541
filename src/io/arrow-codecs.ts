import { compressionRegistry, CompressionType } from 'apache-arrow';
import { decompress as zstdDecompress } from 'fzstd';
import lz4 from 'lz4js';

let registered = false;

/**
 * Registers the decoders for compressed Arrow IPC bodies (apache-arrow's compression registry): ZSTD
 * (the pandas/pyarrow `to_feather` default) with fzstd, LZ4 frame with lz4js. Reading only; called before
 * any Arrow table is decoded. Idempotent.
 */
export function registerArrowCodecs(): void {
  if (registered) return;
  registered = true;
  compressionRegistry.set(CompressionType.ZSTD, { decode: (data) => zstdDecompress(data) });
  compressionRegistry.set(CompressionType.LZ4_FRAME, { decode: (data) => Uint8Array.from(lz4.decompress(data)) });
}
