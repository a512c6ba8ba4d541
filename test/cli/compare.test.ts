import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { parseCsv } from '../../src/io/parse-csv.js';
import { parseModel } from '../../src/io/parse-model.js';
import { parseFloor } from '../../src/io/parse-floor.js';

// Invented 4 × 3 building; the "new" runs come from the same building (no change).
const floor = gridFloor(4, 3, ['oak', 'carpet', 'tile', 'rubber'], (x, y) => (x + 2 * y) % 4, 'compare test floor');
const tmp = tempDir();
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  for (const [name, seed] of [['old.csv', '1'], ['new.csv', '2']]) {
    const r = runCli(['simulate', '--floor', p('floor.json'), '--runs', '30', '--steps', '300', '--seed', seed, '--hit', '0.85', '--dwell', '0.6', '--out', p(name)]);
    expect(r.code, r.stderr).toBe(0);
  }
  const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('old.csv'), '--out', p('old-model.json'), '--restarts', '2', '--workers', '1', '--quiet']);
  expect(fit.code, fit.stderr).toBe(0);
});
afterAll(() => tmp.remove());

describe('compare', () => {
  it('writes the changes table, the re-fitted model and an updated floor, and prints a caution', () => {
    const r = runCli([
      'compare', '--model', p('old-model.json'), '--floor', p('floor.json'), '--runs', p('new.csv'), '--out', p('changes.csv'),
      '--refit', p('refit.json'), '--write-floor', p('floor-after.json'), '--workers', '1', '--null-draws', '3',
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('not an inspection');
    expect(r.stdout).toContain('p-values from 3 copies of the new runs simulated under the old model');
    expect(r.stdout).toMatch(/log-likelihood per reading -?\d/);
    const t = parseCsv(readFileSync(p('changes.csv'), 'utf8'), 'changes.csv');
    expect(t.header).toEqual(['cell', 'surface_before', 'surface_after', 'expected_readings', 'tv_distance', 'g_stat', 'p_value', 'q_value', 'verdict']);
    expect(t.nRows).toBe(12);
    const verdicts = t.columns[8].toArray();
    // The calibration of the p-values is a property test (test/compare/null-calibration.test.ts); what
    // the re-fit can attribute on a floor like this is measured by bench/compare-fdr.ts (DEVELOPERS.md).
    expect(verdicts.every((v) => v === 'changed' || v === 'unchanged' || v === 'too-few-readings')).toBe(true);
    // Sorted by q-value, untested cells last.
    const q = t.columns[7].toArray().map((v) => (v === null ? Infinity : Number(v)));
    for (let k = 1; k < q.length; k++) expect(q[k]).toBeGreaterThanOrEqual(q[k - 1]);
    verdicts.forEach((v, k) => expect(v === 'too-few-readings').toBe(q[k] === Infinity));
    const refit = parseModel(readFileSync(p('refit.json'), 'utf8'), 'refit.json');
    expect(refit.fit?.options.fromDigest).toMatch(/^sha256:[0-9a-f]{64}$/);
    const after = parseFloor(readFileSync(p('floor-after.json'), 'utf8'), 'floor-after.json');
    expect(after.cells.map((c) => c.id)).toEqual(floor.cells.map((c) => c.id));
  });

  it('the same options with the same seed give the same changes table (null draws are seeded)', () => {
    const args = (out: string) => ['compare', '--model', p('old-model.json'), '--floor', p('floor.json'), '--runs', p('new.csv'), '--out', p(out), '--null-draws', '2', '--seed', '5', '--quiet'];
    expect(runCli([...args('c1.csv'), '--workers', '1']).code).toBe(0);
    expect(runCli([...args('c2.csv'), '--workers', '2']).code).toBe(0);
    expect(readFileSync(p('c2.csv'), 'utf8')).toBe(readFileSync(p('c1.csv'), 'utf8'));
  });

  it('a bad --null-draws is one clear line, exit 2', () => {
    const r = runCli(['compare', '--model', p('old-model.json'), '--floor', p('floor.json'), '--runs', p('new.csv'), '--out', p('x.csv'), '--null-draws', '2.5']);
    expect(r.code).toBe(2);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('--null-draws must be a whole number');
  });

  it('a pipeline with a compare section re-fits, writes the changes, the re-fit, the new floor, decodes with the re-fit and reports', () => {
    writeFileSync(
      p('refit-pipeline.json'),
      JSON.stringify({
        format: 'underfoot-pipeline/1',
        floor: 'floor.json',
        runs: ['new.csv'],
        model: 'old-model.json',
        compare: { nullDraws: 2, workers: 1, fdr: 0.1 },
        out: { dir: 'refit-out', changes: 'changes.csv', model: 'model.json', floor: 'floor.json', summary: 'runs.csv', report: 'report.html' },
      }),
    );
    const r = runCli(['run', p('refit-pipeline.json')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('tested cells changed at false-discovery rate 0.1');
    expect(r.stdout).toContain('not an inspection');
    const t = parseCsv(readFileSync(p('refit-out/changes.csv'), 'utf8'), 'changes.csv');
    expect(t.nRows).toBe(12);
    const refit = parseModel(readFileSync(p('refit-out/model.json'), 'utf8'), 'model.json');
    expect(refit.fit?.options.fromDigest).toMatch(/^sha256:/);
    const summary = parseCsv(readFileSync(p('refit-out/runs.csv'), 'utf8'), 'runs.csv');
    expect(summary.nRows).toBe(30);
    expect(readFileSync(p('refit-out/report.html'), 'utf8')).toContain('<html');
    parseFloor(readFileSync(p('refit-out/floor.json'), 'utf8'), 'floor.json');
  });

  it('a model made for another floor is one clear line, exit 2', () => {
    const other = gridFloor(3, 3, ['oak', 'carpet', 'tile', 'rubber'], (x) => x % 4, 'another floor');
    writeFileSync(p('other-floor.json'), JSON.stringify(other));
    const r = runCli(['compare', '--model', p('old-model.json'), '--floor', p('other-floor.json'), '--runs', p('new.csv'), '--out', p('x.csv')]);
    expect(r.code).toBe(2);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('must match the floor');
  });

  it('a model whose readings differ from the floor\'s is one clear line, exit 2', () => {
    const renamed = { ...floor, surfaces: ['oak', 'carpet', 'tile', 'mat'], cells: floor.cells.map((c) => ({ ...c, surface: c.surface === 'rubber' ? 'mat' : c.surface })) };
    writeFileSync(p('renamed-floor.json'), JSON.stringify(renamed));
    const r = runCli(['compare', '--model', p('old-model.json'), '--floor', p('renamed-floor.json'), '--runs', p('new.csv'), '--out', p('x.csv')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('surfaces');
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
  });
});
