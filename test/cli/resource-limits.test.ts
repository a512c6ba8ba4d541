import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

// Shapes fleets produce: very many tiny runs, and one very long run (invented 5 × 4 floor).
const tmp = tempDir();
const p = tmp.path;
beforeAll(() => writeFileSync(p('floor.json'), JSON.stringify(gridFloor(5, 4, ['oak', 'carpet', 'tile'], (x, y) => (x + y) % 3, 'limits floor'))));
afterAll(() => tmp.remove());

describe('resource limits', () => {
  it('a runs table of 10⁵ runs of 3 steps fits and decodes', () => {
    expect(runCli(['simulate', '--floor', p('floor.json'), '--runs', '100000', '--steps', '3', '--seed', '1', '--out', p('many.csv')]).code).toBe(0);
    const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('many.csv'), '--out', p('many.json'), '--restarts', '1', '--max-iter', '3', '--workers', '1', '--quiet']);
    expect(fit.code, fit.stderr).toBe(0);
    const dec = runCli(['decode', '--model', p('many.json'), '--runs', p('many.csv'), '--out', p('many.arrow'), '--summary', p('many-summary.csv')]);
    expect(dec.code, dec.stderr).toBe(0);
    expect(dec.stdout).toContain('decoded 100000 runs, 300000 steps');
  });

  it('one run of 10⁶ steps fits and decodes', () => {
    expect(runCli(['simulate', '--floor', p('floor.json'), '--runs', '1', '--steps', '1000000', '--seed', '2', '--out', p('long.csv')]).code).toBe(0);
    const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('long.csv'), '--out', p('long.json'), '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet']);
    expect(fit.code, fit.stderr).toBe(0);
    const dec = runCli(['decode', '--model', p('long.json'), '--runs', p('long.csv'), '--out', p('long.arrow')]);
    expect(dec.code, dec.stderr).toBe(0);
    expect(dec.stdout).toContain('decoded 1 runs, 1000000 steps');
  });
});
