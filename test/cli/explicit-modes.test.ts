import { describe, it, expect, afterAll } from 'vitest';
import { copyFileSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { parseModel } from '../../src/io/parse-model.js';
import { formatModel } from '../../src/io/format-model.js';

// Models fitted with each explicit transition mode by the build before `--transitions auto` and the
// transition priors existed (test/fixtures/explicit-modes/README.md says how).
const fixture = (name: string): string => fileURLToPath(new URL(`../fixtures/explicit-modes/${name}`, import.meta.url));
const tmp = tempDir();
for (const f of ['floor.json', 'runs.csv']) copyFileSync(fixture(f), tmp.path(f));
afterAll(() => tmp.remove());

const runFit = (mode: string, extra: string[] = []) =>
  runCli(['fit', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', `model-${mode}.json`, '--restarts', '3', '--workers', '1', '--transitions', mode, '--max-iter', '60', ...extra], tmp.dir);

/** The model file without the record's additive `predictiveCalibration` key, formatted as before. */
function withoutCalibration(text: string): string {
  const file = parseModel(text, 'model.json');
  expect(file.fit!.predictiveCalibration).toBeDefined();
  delete file.fit!.predictiveCalibration;
  return formatModel(file);
}

describe('explicit transition modes behave exactly as before auto existed', () => {
  for (const mode of ['tied', 'fixed']) {
    it(`fit --transitions ${mode} writes the same bytes as before (apart from the added predictiveCalibration record)`, () => {
      const r = runFit(mode);
      expect(r.code, r.stderr).toBe(0);
      expect(withoutCalibration(readFileSync(tmp.path(`model-${mode}.json`), 'utf8'))).toBe(readFileSync(fixture(`model-${mode}.json`), 'utf8'));
    });
  }

  it('fit --transitions tied prints the same restarts table and summary lines as before', () => {
    const r = runFit('tied');
    const before = readFileSync(fixture('fit-tied-stdout.txt'), 'utf8').split('\n').filter((l) => !l.startsWith('wrote '));
    const now = r.stdout.split('\n');
    expect(now.slice(0, before.length - 1)).toEqual(before.slice(0, -1));
  });

  it('fit --transitions learned --transition-prior-strength 0 is the old learned mode (same parameters)', () => {
    const r = runFit('learned', ['--transition-prior-strength', '0']);
    expect(r.code, r.stderr).toBe(0);
    const now = parseModel(readFileSync(tmp.path('model-learned.json'), 'utf8'), 'now');
    const before = parseModel(readFileSync(fixture('model-learned.json'), 'utf8'), 'before');
    expect(Array.from(now.model.trans)).toEqual(Array.from(before.model.trans));
    expect(Array.from(now.model.emission)).toEqual(Array.from(before.model.emission));
    expect(now.fit!.restarts).toEqual(before.fit!.restarts);
    expect(now.fit!.options.transitionPriorStrength).toBe(0);
  });
});
