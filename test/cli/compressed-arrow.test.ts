import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { compressionRegistry, CompressionType, RecordBatchFileWriter, RecordBatchStreamWriter, Table, Utf8, Int32, tableFromIPC, vectorFromArray } from 'apache-arrow';
import { registerArrowCodecs } from '../../src/io/arrow-codecs.js';
import lz4 from 'lz4js';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

// Compressed Arrow IPC runs tables (LZ4 frame; zstd, the pandas/pyarrow to_feather default). pyarrow could
// not be installed here (no network), so the files are written with apache-arrow's compression registry:
// LZ4 frames by lz4js, zstd frames by the small raw-block encoder below (valid zstd: RFC 8878, section 3.1.1,
// "Raw_Block"), which exercises the reader's zstd decoder without a zstd compressor.
const floor = gridFloor(3, 3, ['oak', 'tile'], (x, y) => (x + y) % 2, 'compressed arrow test floor');
const tmp = tempDir();
const p = tmp.path;

/** A zstd frame holding `data` in raw (stored) blocks of at most 128 KiB. Source: RFC 8878, 3.1.1. */
function zstdRawFrame(data: Uint8Array): Uint8Array {
  const parts: number[] = [0x28, 0xb5, 0x2f, 0xfd]; // magic 0xFD2FB528, little-endian
  parts.push(0x00); // frame header descriptor: no content size, no checksum, window descriptor follows
  parts.push(0x58); // window descriptor: exponent 11 → 2^21 bytes
  const max = 128 * 1024;
  for (let at = 0; at < data.length || at === 0; at += max) {
    const block = data.subarray(at, Math.min(data.length, at + max));
    const last = at + max >= data.length ? 1 : 0;
    const header = last | (0 << 1) | (block.length << 3); // Block_Type 0 = Raw_Block
    parts.push(header & 0xff, (header >> 8) & 0xff, (header >> 16) & 0xff, ...block);
    if (data.length === 0) break;
  }
  return Uint8Array.from(parts);
}

const rows = 90;
const table = new Table({
  run: vectorFromArray(Array.from({ length: rows }, (_, i) => `r${Math.floor(i / 30)}`), new Utf8()),
  step: vectorFromArray(Array.from({ length: rows }, (_, i) => i % 30), new Int32()),
  reading: vectorFromArray(Array.from({ length: rows }, (_, i) => (i % 3 === 0 ? 'oak' : 'tile')), new Utf8()),
});

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  writeFileSync(p('plain.arrow'), RecordBatchFileWriter.writeAll(table).toUint8Array(true));
  compressionRegistry.set(CompressionType.LZ4_FRAME, { encode: (d) => Uint8Array.from(lz4.compress(d)) });
  writeFileSync(p('lz4.arrow'), RecordBatchFileWriter.writeAll(table, { compressionType: CompressionType.LZ4_FRAME }).toUint8Array(true));
  compressionRegistry.set(CompressionType.ZSTD, { encode: zstdRawFrame });
  writeFileSync(p('zstd.arrows'), RecordBatchStreamWriter.writeAll(table, { compressionType: CompressionType.ZSTD }).toUint8Array(true));
  const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('plain.arrow'), '--out', p('model.json'), '--restarts', '1', '--workers', '1', '-q']);
  expect(fit.code, fit.stderr).toBe(0);
});
afterAll(() => tmp.remove());

describe('compressed Arrow IPC runs tables through the built command', () => {
  it('LZ4-frame and zstd bodies decode to the same annotated rows as the uncompressed file', () => {
    // the fixtures really are compressed: their bodies differ from the plain file's
    expect(readFileSync(p('lz4.arrow')).equals(readFileSync(p('plain.arrow')))).toBe(false);
    const out: Record<string, string> = {};
    for (const name of ['plain.arrow', 'lz4.arrow', 'zstd.arrows']) {
      const r = runCli(['decode', '--model', p('model.json'), '--runs', p(name), '--out', p(`${name}.csv`), '-q']);
      expect(r.code, r.stderr).toBe(0);
      out[name] = readFileSync(p(`${name}.csv`), 'utf8');
    }
    expect(out['lz4.arrow']).toBe(out['plain.arrow']);
    expect(out['zstd.arrows']).toBe(out['plain.arrow']);
    expect(out['plain.arrow'].trim().split('\n')).toHaveLength(rows + 1);
  });
  it('decode --compression zstd|lz4 writes compressed annotated tables that read back to the same rows; CSV outputs are refused', () => {
    registerArrowCodecs(); // this test's raw-block zstd encoder stays; decoders are underfoot's (fzstd, lz4js)
    const base = runCli(['decode', '--model', p('model.json'), '--runs', p('plain.arrow'), '--out', p('plain-out.arrow'), '-q']);
    expect(base.code, base.stderr).toBe(0);
    for (const codec of ['zstd', 'lz4']) {
      const r = runCli(['decode', '--model', p('model.json'), '--runs', p('plain.arrow'), '--out', p(`${codec}-out.arrow`), '--compression', codec, '-q']);
      expect(r.code, r.stderr).toBe(0);
      const a = tableFromIPC(readFileSync(p('plain-out.arrow')));
      const b = tableFromIPC(readFileSync(p(`${codec}-out.arrow`)));
      expect(readFileSync(p(`${codec}-out.arrow`)).length).toBeLessThan(readFileSync(p('plain-out.arrow')).length);
      expect(b.schema.fields.map(String)).toEqual(a.schema.fields.map(String));
      for (const f of a.schema.fields) expect([...b.getChild(f.name)!], f.name).toEqual([...a.getChild(f.name)!]);
    }
    const refused = runCli(['decode', '--model', p('model.json'), '--runs', p('plain.arrow'), '--out', p('refused.csv'), '--compression', 'zstd']);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toContain('--compression zstd must go with an Arrow (.arrow, .feather, .arrows) or Parquet output, got a CSV output');
  });
});
