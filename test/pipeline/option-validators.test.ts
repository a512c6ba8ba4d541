import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';

// One validator per option for the command line and pipelines (issue 16, "one option validator shared by
// the CLI and pipelines"): every out-of-range value below goes through `underfoot <command> --flag value`
// and through a pipeline file run by `underfoot run`, in-process; both must refuse it, exit 2, with the
// same requirement (the message differs only in where it points: `fit: --max-iter` or
// `p.json: "fit.maxIter"`). Options are validated before any file is read, so the paths need not exist.

const dir = mkdtempSync(join(tmpdir(), 'underfoot-options-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(argv: string[]): Promise<{ code: number; err: string }> {
  let err = '';
  const code = await main(argv, { out: () => {}, err: (t) => (err += t), errIsTty: false });
  return { code, err };
}

const kebab = (key: string): string => `--${key.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;

/** The requirement of a one-line error: the text between "must" and ", got". */
function requirement(message: string): string {
  const m = /(must .*), got /.exec(message);
  expect(m, message).not.toBeNull();
  return m![1];
}

// [section, key, value as a flag, value in the pipeline]
const CASES: [string, string, string, unknown][] = [
  ['fit', 'restarts', '0', 0],
  ['fit', 'restarts', '2.5', 2.5],
  ['fit', 'holdout', '1', 1],
  ['fit', 'seed', '-1', -1],
  ['fit', 'transitions', 'sometimes', 'sometimes'],
  ['fit', 'dwell', '1', 1],
  ['fit', 'hit', '0', 0],
  ['fit', 'priorStrength', '-1', -1],
  ['fit', 'transitionPriorStrength', '2e9', 2e9],
  ['fit', 'maxIter', '-1', -1],
  ['fit', 'tol', '-0.1', -0.1],
  ['fit', 'prune', '0.5', 0.5],
  ['compare', 'fdr', '1', 1],
  ['compare', 'minReadings', '-5', -5],
  ['compare', 'nullDraws', '1001', 1001],
  ['compare', 'swapRounds', '101', 101],
  ['compare', 'transitions', 'per-cell', 'per-cell'],
  ['compare', 'priorStrength', '-1', -1],
  ['compare', 'maxIter', '-1', -1],
  ['decode', 'lowConfidence', '1.5', 1.5],
  ['decode', 'surprisingBits', '-1', -1],
];

/** The command line for a case: the command's required options, then the flag under test. */
function cliArgs(section: string, key: string, value: string): string[] {
  const out = join(dir, 'never-written');
  const base: Record<string, string[]> = {
    fit: ['fit', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', `${out}.json`],
    compare: ['compare', '--model', 'model.json', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', `${out}.csv`],
    decode: ['decode', '--model', 'model.json', '--runs', 'runs.csv', '--out', `${out}.csv`],
  };
  return [...base[section], `${kebab(key)}=${value}`];
}

/** A pipeline file for a case: a fit or a compare, with the value under test in its section. */
function pipelineFile(section: string, key: string, value: unknown): string {
  const body: Record<string, unknown> = {
    format: 'underfoot-pipeline/1',
    floor: 'floor.json',
    runs: ['runs.csv'],
    out: { dir: 'out', model: 'model.json', annotated: 'annotated.csv' },
  };
  if (section === 'compare') {
    body.model = 'old-model.json';
    body.compare = { [key]: value };
    body.out = { dir: 'out', changes: 'changes.csv' };
  } else {
    body.fit = section === 'fit' ? { [key]: value } : {};
    if (section === 'decode') body.decode = { [key]: value };
  }
  const file = join(dir, `${section}-${key}.json`);
  writeFileSync(file, JSON.stringify(body));
  return file;
}

describe('the command line and pipelines refuse the same option values, with the same requirement', () => {
  for (const [section, key, flagValue, pipelineValue] of CASES) {
    it(`${section} ${kebab(key)} ${flagValue} / "${section}.${key}": ${JSON.stringify(pipelineValue)}`, async () => {
      const cli = await run(cliArgs(section, key, flagValue));
      const file = pipelineFile(section, key, pipelineValue);
      const pipeline = await run(['run', file]);
      expect(cli.code, cli.err).toBe(2);
      expect(pipeline.code, pipeline.err).toBe(2);
      expect(cli.err).toMatch(new RegExp(`^underfoot: ${section}: ${kebab(key)} must `));
      expect(pipeline.err.startsWith(`underfoot: ${file}: "${section}.${key}" must `), pipeline.err).toBe(true);
      expect(cli.err.trim().split('\n')).toHaveLength(1);
      expect(pipeline.err.trim().split('\n')).toHaveLength(1);
      expect(requirement(pipeline.err)).toBe(requirement(cli.err));
    });
  }

  it('a value both accept is accepted by both: the option check passes and the next check (a missing file) speaks', async () => {
    const cli = await run(cliArgs('decode', 'lowConfidence', '0.25'));
    const pipeline = await run(['run', pipelineFile('decode', 'lowConfidence', 0.25)]);
    expect(cli.err).not.toMatch(/low-confidence/);
    expect(pipeline.err).not.toMatch(/lowConfidence/);
    expect([cli.code, pipeline.code]).toEqual([2, 2]);
  });
});
