import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tableFromIPC } from 'apache-arrow';
import { parquetMetadata } from 'hyparquet';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { TOOL_VERSION } from '../../src/version.js';

// An invented 3 × 3 floor; the Arrow and Parquet outputs carry their provenance in schema metadata.
const floor = gridFloor(3, 3, ['oak', 'tile'], (x, y) => (x + y) % 2, 'metadata test floor');
const tmp = tempDir();
const p = tmp.path;

function ok(args: string[]): string {
  const r = runCli(args);
  expect(r.code, r.stderr).toBe(0);
  return r.stdout + r.stderr;
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  ok(['simulate', '--floor', p('floor.json'), '--runs', '2', '--steps', '30', '--seed', '1', '--out', p('runs.csv'), '-q']);
  ok(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--workers', '1', '-q']);
});
afterAll(() => tmp.remove());

describe('self-describing annotated table and run summary', () => {
  it('Arrow and Parquet outputs carry version, model digest, thresholds and the printed caution', () => {
    const printed = ok(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('a.arrow'), '--summary', p('s.parquet'), '--low-confidence', '0.6']);
    const digest = `sha256:${createHash('sha256').update(readFileSync(p('model.json'))).digest('hex')}`;
    const arrow = tableFromIPC(readFileSync(p('a.arrow')));
    const meta = arrow.schema.metadata;
    expect(meta.get('underfoot.version')).toBe(TOOL_VERSION);
    expect(meta.get('underfoot.table')).toBe('annotated');
    expect(meta.get('underfoot.model_sha256')).toBe(digest);
    expect(JSON.parse(meta.get('underfoot.thresholds')!).lowConfidence).toBe(0.6);
    expect(printed).toContain(meta.get('underfoot.caution')!);
    const s = readFileSync(p('s.parquet'));
    const kv = parquetMetadata(s.buffer.slice(s.byteOffset, s.byteOffset + s.byteLength)).key_value_metadata ?? [];
    const get = (k: string) => kv.find((e) => e.key === k)?.value;
    expect(get('underfoot.table')).toBe('run summary');
    expect(get('underfoot.model_sha256')).toBe(meta.get('underfoot.model_sha256'));
    expect(get('underfoot.caution')).toBe(meta.get('underfoot.caution'));
    // the flag columns are Arrow booleans
    expect(String(arrow.schema.fields.find((f) => f.name === 'flag_dropout')!.type)).toBe('Bool');
  });
});
