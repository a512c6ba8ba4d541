import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync } from 'node:fs';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import * as flatbuffers from 'flatbuffers';
import { Message } from 'apache-arrow/fb/message';
import { MessageHeader } from 'apache-arrow/fb/message-header';
import { RecordBatch as FbRecordBatch } from 'apache-arrow/fb/record-batch';
import { DictionaryBatch as FbDictionaryBatch } from 'apache-arrow/fb/dictionary-batch';
import { CompressionType } from 'apache-arrow/fb/compression-type';
import { BodyCompressionMethod } from 'apache-arrow/fb/body-compression-method';
import { Bool, tableFromIPC } from 'apache-arrow';
import { decompress as zstdDecompress } from 'fzstd';
import lz4 from 'lz4js';
import { parquetMetadata } from 'hyparquet';
import { writeTable } from '../../src/io/write-table.js';
import { registerArrowCodecs } from '../../src/io/arrow-codecs.js';
import { runsFromParquet } from '../../src/io/parse-parquet-runs.js';
import { outputTableFormatOf, setTableCompression } from '../../src/io/table-compression.js';
import type { OutputTable } from '../../src/io/output-table.js';

// Compressed Arrow IPC outputs. The layout is checked against the Arrow columnar format specification
// (Source: Apache Arrow, "Arrow Columnar Format", sections "Encapsulated message format" and
// "Compression", and Message.fbs `BodyCompression`): a stream is messages of
// [0xFFFFFFFF][int32 metadata length][flatbuffer Message][padding to 8][body]; a compressed RecordBatch or
// DictionaryBatch names codec and method BUFFER; every body buffer starts 8-byte aligned and holds an
// int64 little-endian uncompressed length (−1 = stored uncompressed) followed by the codec's frame.

const n = 5000;
const ids = ['A-01', 'A-02', 'B-01'];
const table: OutputTable = {
  nRows: n,
  columns: [
    { name: 'run', kind: 'dictionary', get: (r) => `run-${Math.floor(r / 1000)}` },
    { name: 'step', kind: 'int64', get: (r) => (r % 1000) + 2 ** 40 },
    { name: 'reading', kind: 'utf8', get: (r) => (r % 17 === 0 ? null : r % 3 === 0 ? 'oak' : 'tile') },
    { name: 'path_cell', kind: 'dictionary', dictionary: ids, code: (r) => (r % 11 === 0 ? -1 : Math.floor(r / 7) % 3), get: (r) => (r % 11 === 0 ? null : ids[Math.floor(r / 7) % 3]) },
    { name: 'path_p', kind: 'float64', get: (r) => (r % 13 === 0 ? null : 1 / (1 + (r % 97))) },
    { name: 'path_level', kind: 'int32', get: (r) => r % 2 },
    { name: 'flag_dropout', kind: 'passthrough', arrowType: new Bool(), get: (r) => r % 17 === 0 },
  ],
  metadata: { 'underfoot.table': 'test' },
};

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'uf-compress-'));
  registerArrowCodecs();
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface BodyBuffer {
  offset: number;
  length: number;
  bytes: Uint8Array;
}
interface WalkedMessage {
  header: MessageHeader;
  codec: CompressionType | null;
  method: BodyCompressionMethod | null;
  buffers: BodyBuffer[];
}

/** Walks an Arrow IPC stream message by message, per the specification's encapsulated message format. */
function walkStream(bytes: Uint8Array): WalkedMessage[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out: WalkedMessage[] = [];
  let at = 0;
  for (;;) {
    expect(view.getUint32(at, true)).toBe(0xffffffff); // continuation marker
    const metaLength = view.getInt32(at + 4, true);
    if (metaLength === 0) break; // end-of-stream marker
    expect((8 + metaLength) % 8).toBe(0); // metadata padded so the body starts 8-byte aligned
    const message = Message.getRootAsMessage(new flatbuffers.ByteBuffer(bytes.subarray(at + 8, at + 8 + metaLength)));
    const bodyStart = at + 8 + metaLength;
    const bodyLength = Number(message.bodyLength());
    const body = bytes.subarray(bodyStart, bodyStart + bodyLength);
    const header = message.headerType();
    let batch: FbRecordBatch | null = null;
    if (header === MessageHeader.RecordBatch) batch = message.header(new FbRecordBatch()) as FbRecordBatch;
    if (header === MessageHeader.DictionaryBatch) batch = (message.header(new FbDictionaryBatch()) as FbDictionaryBatch).data();
    const buffers: BodyBuffer[] = [];
    let codec: CompressionType | null = null;
    let method: BodyCompressionMethod | null = null;
    if (batch) {
      const compression = batch.compression();
      codec = compression ? compression.codec() : null;
      method = compression ? compression.method() : null;
      for (let i = 0; i < batch.buffersLength(); i++) {
        const b = batch.buffers(i)!;
        const offset = Number(b.offset());
        const length = Number(b.length());
        buffers.push({ offset, length, bytes: body.subarray(offset, offset + length) });
      }
    }
    out.push({ header, codec, method, buffers });
    at = bodyStart + bodyLength;
  }
  return out;
}

describe('writeTable(path, table, { compression })', () => {
  it.each([
    ['zstd', CompressionType.ZSTD, (b: Uint8Array) => zstdDecompress(b), [0x28, 0xb5, 0x2f, 0xfd]], // zstd frame magic (RFC 8878, 3.1.1)
    ['lz4', CompressionType.LZ4_FRAME, (b: Uint8Array) => Uint8Array.from(lz4.decompress(b)), [0x04, 0x22, 0x4d, 0x18]], // LZ4 frame magic (LZ4 Frame Format Description, "General Structure")
  ] as const)('%s: every body buffer is laid out as the Arrow specification prescribes and decodes to the uncompressed bytes', async (name, codec, decode, magic) => {
    await writeTable(join(dir, 'plain.arrows'), table, { compression: null });
    await writeTable(join(dir, `${name}.arrows`), table, { compression: name });
    const plain = walkStream(readFileSync(join(dir, 'plain.arrows')));
    const packed = walkStream(readFileSync(join(dir, `${name}.arrows`)));
    expect(packed.map((m) => m.header)).toEqual(plain.map((m) => m.header));
    // one dictionary batch per dictionary column (run, path_cell), then the record batch
    expect(packed.filter((m) => m.header === MessageHeader.DictionaryBatch)).toHaveLength(2);
    let compressed = 0;
    for (const [k, m] of packed.entries()) {
      if (m.header === MessageHeader.Schema) continue;
      expect(m.codec).toBe(codec);
      expect(m.method).toBe(BodyCompressionMethod.BUFFER);
      expect(plain[k].codec).toBe(null);
      expect(m.buffers).toHaveLength(plain[k].buffers.length);
      for (const [j, b] of m.buffers.entries()) {
        const original = plain[k].buffers[j].bytes;
        if (b.length === 0) {
          expect(original.length).toBe(0);
          continue;
        }
        expect(b.offset % 8).toBe(0);
        const prefix = new DataView(b.bytes.buffer, b.bytes.byteOffset, 8).getBigInt64(0, true);
        const rest = b.bytes.subarray(8);
        // The uncompressed writer pads each buffer to a multiple of 8 bytes with zeros; a compressed
        // buffer holds the unpadded bytes.
        const unpadded = (d: Uint8Array) => {
          expect(original.length).toBe((d.length + 7) & ~7);
          expect(original.subarray(d.length).every((x) => x === 0)).toBe(true);
          return Array.from(original.subarray(0, d.length));
        };
        if (prefix === -1n) {
          expect(Array.from(rest)).toEqual(unpadded(rest)); // stored as is: compression did not pay
          continue;
        }
        compressed++;
        expect(Array.from(rest.subarray(0, 4))).toEqual(magic);
        const decoded = decode(rest);
        expect(decoded.length).toBe(Number(prefix));
        expect(Array.from(decoded)).toEqual(unpadded(decoded));
      }
    }
    expect(compressed).toBeGreaterThan(5);
    expect(readFileSync(join(dir, `${name}.arrows`)).length).toBeLessThan(readFileSync(join(dir, 'plain.arrows')).length);
  });

  it.each(['zstd', 'lz4'] as const)('%s: the Arrow file format reads back with the same schema, values and metadata', async (name) => {
    await writeTable(join(dir, 'plain.arrow'), table, { compression: null });
    await writeTable(join(dir, `${name}.arrow`), table, { compression: name });
    const a = tableFromIPC(readFileSync(join(dir, 'plain.arrow')));
    const b = tableFromIPC(readFileSync(join(dir, `${name}.arrow`)));
    expect(b.schema.fields.map((f) => `${f.name}:${f.type}`)).toEqual(a.schema.fields.map((f) => `${f.name}:${f.type}`));
    expect(b.schema.metadata.get('underfoot.table')).toBe('test');
    expect(b.numRows).toBe(n);
    for (const f of a.schema.fields) expect([...b.getChild(f.name)!], f.name).toEqual([...a.getChild(f.name)!]);
    expect(b.getChild('step')!.get(3)).toBe(2n ** 40n + 3n);
  });

  it('zstd Parquet: pages are ZSTD and read back through the runs reader', async () => {
    const path = join(dir, 'z.parquet');
    await writeTable(path, table, { compression: 'zstd' });
    const bytes = readFileSync(path);
    const meta = parquetMetadata(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
    for (const c of meta.row_groups[0].columns) expect(c.meta_data!.codec).toBe('ZSTD');
    const runs = await runsFromParquet(new Uint8Array(bytes), path, { surfaces: ['oak', 'tile'] });
    expect(runs.runs.map((r) => r.id)).toEqual(['run-0', 'run-1', 'run-2', 'run-3', 'run-4']);
    expect(runs.runs[0].obs.length).toBe(1000);
  });

  it('refuses compression for CSV, LZ4 for Parquet and unknown codecs, naming the output', () => {
    expect(() => outputTableFormatOf('out.csv', 'zstd')).toThrow('out.csv: --compression zstd must go with an Arrow (.arrow, .feather, .arrows) or Parquet output, got a CSV output');
    expect(() => outputTableFormatOf('out.parquet', 'lz4')).toThrow('out.parquet: --compression of a Parquet output must be zstd, got lz4');
    expect(outputTableFormatOf('out.feather', 'lz4')).toBe('arrow-file');
    expect(() => setTableCompression('gzip', 'decode')).toThrow('decode: --compression must be one of zstd, lz4, none, got "gzip"');
    setTableCompression(null, 'decode');
  });
});
