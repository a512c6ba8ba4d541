import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { parquetWriteBuffer } from 'hyparquet-writer';
import { parquetMetadata, parquetReadObjects } from 'hyparquet';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

// An invented 4 × 3 floor; runs written and read as Parquet give the same results as CSV.
const floor = gridFloor(4, 3, ['oak', 'tile', 'carpet'], (x, y) => (x + 2 * y) % 3, 'parquet test floor');
const tmp = tempDir();
const p = tmp.path;

function ok(args: string[]): void {
  const r = runCli(args);
  expect(r.code, r.stderr).toBe(0);
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  const sim = ['simulate', '--floor', p('floor.json'), '--runs', '4', '--steps', '60', '--seed', '5', '--gap-rate', '0.05', '--dropout-rate', '0.05', '-q'];
  ok([...sim, '--out', p('runs.csv')]);
  ok([...sim, '--out', p('runs.parquet')]);
  ok(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--workers', '1', '-q']);
});
afterAll(() => tmp.remove());

describe('Parquet through the built command', () => {
  it('simulate writes Parquet with the same rows as CSV; decode of either gives the same annotated rows', async () => {
    const file = readFileSync(p('runs.parquet'));
    const buf = file.buffer.slice(file.byteOffset, file.byteOffset + file.byteLength);
    const rows = (await parquetReadObjects({ file: buf })) as Array<Record<string, unknown>>;
    const csv = readFileSync(p('runs.csv'), 'utf8').trim().split('\n');
    expect(rows).toHaveLength(csv.length - 1);
    expect(`${rows[0].run},${rows[0].step},${rows[0].reading ?? ''},${rows[0].true_cell}`).toBe(csv[1]);
    ok(['decode', '--model', p('model.json'), '--runs', p('runs.parquet'), '--out', p('from-parquet.csv'), '--summary', p('summary.parquet'), '-q']);
    ok(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('from-csv.csv'), '-q']);
    expect(readFileSync(p('from-parquet.csv'), 'utf8')).toBe(readFileSync(p('from-csv.csv'), 'utf8'));
    const s = readFileSync(p('summary.parquet'));
    const summary = (await parquetReadObjects({ file: s.buffer.slice(s.byteOffset, s.byteOffset + s.byteLength) })) as Array<Record<string, unknown>>;
    expect(summary.map((r) => r.run)).toEqual(['sim-001', 'sim-002', 'sim-003', 'sim-004']);
    expect(typeof summary[0].steps).toBe('number');
    const md = parquetMetadata(s.buffer.slice(s.byteOffset, s.byteOffset + s.byteLength));
    expect(md.schema.find((e) => e.name === 'steps')?.type).toBe('INT32');
  });

  it('a Parquet timestamp column works with --time-col and is refused as a step column', () => {
    const n = 40;
    const start = Date.UTC(2026, 2, 1, 9, 30);
    writeFileSync(p('stamped.parquet'), new Uint8Array(parquetWriteBuffer({ columnData: [
      { name: 'run', data: Array.from({ length: n }, () => 'r1'), type: 'STRING' },
      { name: 'when', data: Array.from({ length: n }, (_, i) => new Date(start + 250 * i + (i % 3) * 20)), type: 'TIMESTAMP' },
      { name: 'reading', data: Array.from({ length: n }, (_, i) => ['oak', 'tile', 'carpet'][i % 3]), type: 'STRING' },
    ] })));
    ok(['decode', '--model', p('model.json'), '--runs', p('stamped.parquet'), '--time-col', 'when', '--period', '250ms', '--out', p('stamped-out.csv'), '-q']);
    const lines = readFileSync(p('stamped-out.csv'), 'utf8').trim().split('\n');
    const header = lines[0].split(',');
    expect(lines.slice(1).map((l) => Number(l.split(',')[header.indexOf('step')]))).toEqual(Array.from({ length: n }, (_, i) => i));
    const r = runCli(['check', '--floor', p('floor.json'), '--runs', p('stamped.parquet'), '--step-col', 'when']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toMatch(/must hold step numbers, got a Parquet timestamp column \(use --time-col when, with --period\)$/);
  });

  it('a file that is not Parquet is one line, exit 2', () => {
    writeFileSync(p('bad.parquet'), 'run,step,reading\n');
    const r = runCli(['check', '--floor', p('floor.json'), '--runs', p('bad.parquet')]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('file must be Parquet');
  });
});
