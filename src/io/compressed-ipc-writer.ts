import { compressionRegistry, CompressionType, RecordBatchFileWriter, RecordBatchStreamWriter, type Table } from 'apache-arrow';
import { BufferRegion } from 'apache-arrow/ipc/metadata/message';

type Compressed = { byteLength: number; bufferRegions: BufferRegion[]; buffers: Uint8Array[] };

/**
 * Lays out the body buffers of one compressed record or dictionary batch as the Arrow IPC format
 * prescribes (Arrow Columnar Format, "Compression"; Message.fbs, `BodyCompression` with method BUFFER):
 * each non-empty buffer becomes an int64 little-endian prefix holding its UNCOMPRESSED length, then the
 * codec's frame; when the frame is not smaller, the prefix is −1 and the bytes follow as they are. Each
 * buffer starts at an 8-byte-aligned body offset (the writer pads after each pair of pieces).
 *
 * apache-arrow 21's own writer stores the compressed length in that prefix, which its own reader ignores
 * but which readers that follow the specification (Arrow C++, pyarrow) take as the size to decompress
 * into; this replaces that one method.
 */
function compressBodyBuffers(type: CompressionType, buffers: ArrayBufferView[]): Compressed {
  const codec = compressionRegistry.get(type);
  if (!codec?.encode) throw new Error(`Arrow compression ${CompressionType[type]} must have an encoder registered, got none`);
  const out: Uint8Array[] = [];
  const regions: BufferRegion[] = [];
  let offset = 0;
  for (const view of buffers) {
    const bytes = view instanceof Uint8Array ? view : new Uint8Array(view.buffer, view.byteOffset, view.byteLength);
    if (bytes.length === 0) {
      out.push(new Uint8Array(0), new Uint8Array(0));
      regions.push(new BufferRegion(offset, 0));
      continue;
    }
    const packed = codec.encode(bytes);
    const pays = packed.length < bytes.length;
    const prefix = new Uint8Array(8);
    new DataView(prefix.buffer).setBigInt64(0, pays ? BigInt(bytes.length) : -1n, true);
    const body = pays ? packed : bytes;
    out.push(prefix, body);
    regions.push(new BufferRegion(offset, 8 + body.length));
    offset += (8 + body.length + 7) & ~7;
  }
  return { byteLength: offset, bufferRegions: regions, buffers: out };
}

class CompressedFileWriter extends RecordBatchFileWriter {
  protected override _compressBodyBuffers(buffers: ArrayBufferView[]): Compressed {
    return compressBodyBuffers(this._compression!.type, buffers);
  }
}

class CompressedStreamWriter extends RecordBatchStreamWriter {
  protected override _compressBodyBuffers(buffers: ArrayBufferView[]): Compressed {
    return compressBodyBuffers(this._compression!.type, buffers);
  }
}

/**
 * Arrow IPC bytes (file or stream format) of `table` with every record and dictionary batch body
 * compressed by `type`, whose encoder must be registered (`registerArrowEncoder`).
 */
export function compressedTableToIPC(table: Table, stream: boolean, type: CompressionType): Uint8Array {
  const writer = stream ? new CompressedStreamWriter({ compressionType: type }) : new CompressedFileWriter({ compressionType: type });
  return writer.writeAll(table).toUint8Array(true);
}
