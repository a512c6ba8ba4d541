import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { tableFromIPC } from 'apache-arrow';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { registerArrowCodecs } from '../../src/io/arrow-codecs.js';

// The library through its package entry, as a user imports it: `import { … } from 'underfoot'` resolves
// by the package's own name (package.json "exports", Node's package self-reference) to the build in dist/.
const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const TSX = fileURLToPath(new URL('../../node_modules/tsx/dist/cli.mjs', import.meta.url));
const tmp = tempDir();
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(gridFloor(3, 3, ['oak', 'tile'], (x, y) => (x * y + x) % 2, 'library test floor')));
  const sim = runCli(['simulate', '--floor', p('floor.json'), '--runs', '6', '--steps', '80', '--seed', '3', '--out', p('runs.csv')]);
  expect(sim.code, sim.stderr).toBe(0);
});
afterAll(() => tmp.remove());

function node(args: string[]) {
  return spawnSync(process.execPath, args, { cwd: ROOT, encoding: 'utf8' });
}

describe("import { … } from 'underfoot'", () => {
  it('exposes the main operations with their defaults (file-level and in-memory), and no CLI internals', () => {
    const script = `
      import * as uf from 'underfoot';
      const names = ['readFloor', 'readRuns', 'buildModel', 'fitModel', 'decodeRun', 'decodeRuns', 'compareCells',
        'fitFromFiles', 'decodeFromFiles', 'compareFromFiles', 'simulateToFile', 'runPipeline', 'writeTable', 'writeGeoJson',
        'tableToArrowBytes', 'tableToParquetBytes', 'tableToCsv', 'floorToWgs84', 'InputError', 'WorkError'];
      console.log(JSON.stringify({ missing: names.filter((n) => typeof uf[n] !== 'function'),
        restarts: uf.DEFAULT_FIT_OPTIONS.restarts, lowConfidence: uf.DEFAULT_THRESHOLDS.lowConfidence,
        cli: 'registerDecode' in uf || 'main' in uf }));`;
    const r = node(['--input-type=module', '-e', script]);
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual({ missing: [], restarts: 8, lowConfidence: 0.5, cli: false });
  });

  it.each([
    ['JavaScript', 'readme-example.mjs', (file: string) => [file]],
    ['TypeScript (tsx)', 'readme-example.ts', (file: string) => [TSX, file]],
  ])('the README example runs from %s: fit, decode, zstd Arrow and CSV written', (_, name, argv) => {
    const out = tempDir();
    try {
      const r = node([...argv(fileURLToPath(new URL(name, import.meta.url))), p('floor.json'), p('runs.csv'), out.dir]);
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout.trim()).toBe('480 rows decoded');
      registerArrowCodecs();
      const annotated = tableFromIPC(readFileSync(out.path('annotated.arrow')));
      expect(annotated.numRows).toBe(480);
      expect(annotated.schema.fields.map((f) => f.name)).toContain('likely_p');
      expect(readFileSync(out.path('summary.csv'), 'utf8').split('\n')[0]).toContain('run,steps,dropouts,split,loglik');
    } finally {
      out.remove();
    }
  });

  it('type-checks the TypeScript example against the published declarations (dist/src/index.d.ts)', () => {
    const tsc = fileURLToPath(new URL('../../node_modules/typescript/bin/tsc', import.meta.url));
    const r = node([tsc, '--noEmit', '--strict', '--skipLibCheck', '--target', 'ES2022', '--module', 'NodeNext', '--moduleResolution', 'NodeNext', '--types', 'node', fileURLToPath(new URL('readme-example.ts', import.meta.url))]);
    expect(r.status, r.stdout + r.stderr).toBe(0);
  });
});
