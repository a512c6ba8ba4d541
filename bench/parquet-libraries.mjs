// Measures Parquet write/read of a runs-like table (run, step, reading, moved) with hyparquet(+writer)
// and parquet-wasm (via Arrow IPC). Usage: node bench/parquet-libraries.mjs ROWS LIB (LIB: hy | wasm)
// parquet-wasm is not a dependency (it lost the comparison): `npm i --no-save parquet-wasm@0.8.0` before the "wasm" run.
import { parquetWriteBuffer } from 'hyparquet-writer';
import { parquetRead } from 'hyparquet';
import { tableToIPC, tableFromIPC, tableFromArrays, vectorFromArray, Utf8, Table, Int32, Float64 } from 'apache-arrow';
const n = Number(process.argv[2] ?? 1e6);
const lib = process.argv[3] ?? 'hy';
const surfaces = ['oak', 'tile', 'carpet', 'concrete'];
const run = Array.from({ length: n }, (_, i) => `run-${Math.floor(i / 1000)}`);
const step = Int32Array.from({ length: n }, (_, i) => i % 1000);
const reading = Array.from({ length: n }, (_, i) => surfaces[(i * 7919) % 4]);
const moved = Float64Array.from({ length: n }, (_, i) => ((i * 31) % 100) / 1000);
const mb = () => Math.round(process.memoryUsage().rss / 2 ** 20);
const base = mb();
let t = performance.now();
let bytes;
if (lib === 'hy') {
  bytes = new Uint8Array(parquetWriteBuffer({ columnData: [
    { name: 'run', data: run, type: 'STRING' }, { name: 'step', data: step, type: 'INT32' },
    { name: 'reading', data: reading, type: 'STRING' }, { name: 'moved', data: moved, type: 'DOUBLE' } ] }));
} else {
  const w = await import('parquet-wasm');
  const table = new Table({ run: vectorFromArray(run, new Utf8()), step: vectorFromArray(step, new Int32()), reading: vectorFromArray(reading, new Utf8()), moved: vectorFromArray(moved, new Float64()) });
  const ipc = tableToIPC(table, 'stream');
  console.error(`arrow table + IPC built in ${Math.round(performance.now() - t)} ms`);
  bytes = w.writeParquet(w.Table.fromIPCStream(ipc));
}
const writeMs = performance.now() - t;
const afterWrite = mb();
t = performance.now();
let rows;
if (lib === 'hy') {
  const buf = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength);
  const cols = { run: [], step: [], reading: [], moved: [] };
  await parquetRead({ file: buf, onChunk: (c) => cols[c.columnName].push(c.columnData) });
  rows = cols.step.reduce((s, a) => s + a.length, 0);
} else {
  const w = await import('parquet-wasm');
  rows = tableFromIPC(w.readParquet(bytes).intoIPCStream()).numRows;
}
const readMs = performance.now() - t;
console.log(JSON.stringify({ lib, rows, bytes: bytes.length, writeMs: Math.round(writeMs), readMs: Math.round(readMs), rssBaseMB: base, rssAfterWriteMB: afterWrite, rssAfterReadMB: mb() }));
