import { compressionRegistry, CompressionType } from 'apache-arrow';
import { decompress as zstdDecompress } from 'fzstd';
import lz4 from 'lz4js';
import type { TableCompression } from './table-compression.js';
import { loadZstdCompressor } from './zstd-compressor.js';

let registered = false;

/**
 * zstd-decodes one body buffer. fzstd may return a view at an offset that is not a multiple of 8 (e.g.
 * 12), and apache-arrow then cannot view an Int64 or Float64 buffer in place: such a view is copied.
 */
function zstdDecode(data: Uint8Array): Uint8Array {
  const out = zstdDecompress(data);
  return out.byteOffset % 8 === 0 ? out : out.slice();
}

/**
 * Registers the decoders for compressed Arrow IPC bodies (apache-arrow's compression registry): ZSTD
 * (the pandas/pyarrow `to_feather` default) with fzstd, LZ4 frame with lz4js. Reading only; called before
 * any Arrow table is decoded. Idempotent.
 */
export function registerArrowCodecs(): void {
  if (registered) return;
  registered = true;
  compressionRegistry.set(CompressionType.ZSTD, { decode: zstdDecode });
  compressionRegistry.set(CompressionType.LZ4_FRAME, { decode: (data) => Uint8Array.from(lz4.decompress(data)) });
}

/**
 * Registers the encoder (with its decoder) of `compression` for writing compressed Arrow IPC bodies:
 * zstd with @bokuweb/zstd-wasm, LZ4 frame with lz4js. apache-arrow's writer then stores each body buffer
 * as the Arrow IPC format's BodyCompression prescribes (docs/formats.md, "Compressed Arrow outputs").
 * Returns the Arrow compression type.
 */
export async function registerArrowEncoder(compression: TableCompression): Promise<CompressionType> {
  registerArrowCodecs();
  if (compression === 'zstd') {
    const compress = await loadZstdCompressor();
    compressionRegistry.set(CompressionType.ZSTD, { encode: compress, decode: zstdDecode });
    return CompressionType.ZSTD;
  }
  compressionRegistry.set(CompressionType.LZ4_FRAME, {
    encode: (data) => Uint8Array.from(lz4.compress(data)),
    decode: (data) => Uint8Array.from(lz4.decompress(data)),
  });
  return CompressionType.LZ4_FRAME;
}
