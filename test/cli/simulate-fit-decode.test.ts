import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { buildModel } from '../../src/model/build-model.js';
import { formatModel } from '../../src/io/format-model.js';
import { parseModel } from '../../src/io/parse-model.js';
import { parseCsv } from '../../src/io/parse-csv.js';
import { emIteration } from '../../src/fit/em-iteration.js';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { SeededRandom } from '../../src/model/seeded-random.js';

// An invented 4 × 3 floor with a one-way link; the truth model's rows differ from the survey prior
// (look-alike confusion), so the fit has real work to do.
const surfaces = ['oak', 'carpet', 'tile', 'rubber'];
const floor = gridFloor(4, 3, surfaces, (x, y) => (x + 2 * y) % 4, 'cli test floor');
floor.links.push({ from: 'g-0-0', to: 'g-3-2', oneway: true });
const truth = buildModel(floor, { dwell: 0.7, hit: 0.8 });
{
  const rng = new SeededRandom(42);
  const m = surfaces.length;
  for (let i = 0; i < floor.cells.length; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(40 * (r === surfaces.indexOf(floor.cells[i].surface) ? 0.85 : 0.15 / 3));
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
}

const tmp = tempDir();
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  writeFileSync(p('truth.json'), formatModel({ name: 'truth', model: truth, fit: null }));
  const sim = runCli(['simulate', '--floor', p('floor.json'), '--model', p('truth.json'), '--runs', '60', '--steps', '500', '--seed', '5', '--dropout-rate', '0.03', '--out', p('runs.csv')]);
  expect(sim.code, sim.stderr).toBe(0);
});
afterAll(() => tmp.remove());

function viterbiAccuracy(annotatedCsv: string): number {
  const t = parseCsv(annotatedCsv, 'annotated.csv');
  const truthCol = t.columns[t.header.indexOf('true_cell')];
  const pathCol = t.columns[t.header.indexOf('path_cell')];
  let hit = 0;
  for (let r = 0; r < t.nRows; r++) if (truthCol.get(r) === pathCol.get(r)) hit++;
  return hit / t.nRows;
}

describe('simulate → fit → decode through the built command', () => {
  it('fit recovers the true emission rows (mean total variation ≤ 0.05 on cells with ≥ 200 expected readings)', () => {
    const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '3', '--workers', '1']);
    expect(fit.code, fit.stderr).toBe(0);
    expect(fit.stdout).toContain('chosen: restart');
    const model = parseModel(readFileSync(p('model.json'), 'utf8'), 'model.json').model;
    const runs = runsFromCsv(readFileSync(p('runs.csv'), 'utf8'), 'runs.csv', { surfaces }).runs;
    const counts = emIteration(model, runs, { mode: 'tied', priorStrength: 0 }).counts;
    const n = floor.cells.length;
    const m = surfaces.length;
    let tvSum = 0;
    let nCells = 0;
    for (let i = 0; i < n; i++) {
      let expected = 0;
      for (let r = 0; r < m; r++) expected += counts.emitT[r * n + i];
      if (expected < 200) continue;
      let tv = 0;
      for (let r = 0; r < m; r++) tv += Math.abs(model.emission[i * m + r] - truth.emission[i * m + r]) / 2;
      tvSum += tv;
      nCells++;
    }
    expect(nCells).toBeGreaterThanOrEqual(8);
    expect(tvSum / nCells).toBeLessThanOrEqual(0.05);
  });

  it('decoding with the fitted model is within 2 percentage points of decoding with the true model', () => {
    const a = runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('fitted.csv'), '--summary', p('summary.csv')]);
    expect(a.code, a.stderr).toBe(0);
    expect(a.stdout).toContain('not a safety function');
    const b = runCli(['decode', '--model', p('truth.json'), '--runs', p('runs.csv'), '--out', p('true.csv')]);
    expect(b.code, b.stderr).toBe(0);
    const fitted = viterbiAccuracy(readFileSync(p('fitted.csv'), 'utf8'));
    const best = viterbiAccuracy(readFileSync(p('true.csv'), 'utf8'));
    expect(best).toBeGreaterThan(0.5); // the floor is localisable at all
    expect(Math.abs(fitted - best)).toBeLessThanOrEqual(0.02);
  });

  it('decode writes every contract column, input columns first, rows in input order', () => {
    const ann = parseCsv(readFileSync(p('fitted.csv'), 'utf8'), 'fitted.csv');
    const input = parseCsv(readFileSync(p('runs.csv'), 'utf8'), 'runs.csv');
    expect(ann.header).toEqual([
      ...input.header, 'path_cell', 'path_p', 'likely_cell', 'likely_p', 'entropy_bits', 'surprise_bits', 'flag',
      'path_zone', 'likely_zone', 'zone_p', 'path_x', 'path_y', 'path_level', 'mean_x', 'mean_y', 'spread_m', 'mean_level', 'flag_dropout', 'flag_low_confidence', 'flag_surprising', 'flag_impossible',
    ]);
    expect(ann.nRows).toBe(input.nRows);
    for (let c = 0; c < input.header.length; c++) expect(ann.columns[c].toArray()).toEqual(input.columns[c].toArray());
    const flags = new Set(ann.columns[ann.header.indexOf('flag')].toArray());
    expect(flags.has('dropout') || [...flags].some((f) => f?.includes('dropout'))).toBe(true);
    // Each flag's boolean column says exactly whether the flag text names it.
    const text = ann.columns[ann.header.indexOf('flag')].toArray();
    for (const name of ['dropout', 'low_confidence', 'surprising', 'impossible']) {
      const column = ann.columns[ann.header.indexOf(`flag_${name}`)].toArray();
      const expected = text.map((f) => String((f ?? '').split('+').includes(name.replace('_', '-'))));
      expect(column).toEqual(expected);
    }
    expect(ann.columns[ann.header.indexOf('flag_low_confidence')].toArray()).toContain('true');
    const summary = parseCsv(readFileSync(p('summary.csv'), 'utf8'), 'summary.csv');
    expect(summary.header).toEqual([
      'run', 'steps', 'dropouts', 'split', 'loglik', 'loglik_per_reading', 'path_logprob', 'mean_path_p', 'low_confidence_steps', 'surprising_steps',
      'gap_steps', 'mean_zone_p', 'low_confidence_zone_steps',
    ]);
    expect(summary.nRows).toBe(60);
    expect(new Set(summary.columns[3].toArray())).toEqual(new Set(['fit', 'held-out']));
  });

  it('the same seed gives a byte-identical model file with --workers 1 and --workers 2', () => {
    const args = ['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--restarts', '2', '--max-iter', '15', '--quiet'];
    expect(runCli([...args, '--out', p('w1.json'), '--workers', '1']).code).toBe(0);
    expect(runCli([...args, '--out', p('w2.json'), '--workers', '2']).code).toBe(0);
    expect(readFileSync(p('w2.json'), 'utf8')).toBe(readFileSync(p('w1.json'), 'utf8'));
    expect(runCli([...args, '--out', p('s9.json'), '--seed', '9']).code).toBe(0);
    const seeds = (f: string) => parseModel(readFileSync(p(f), 'utf8'), f).fit!.restarts.map((r) => r.seed);
    expect(seeds('s9.json')).not.toEqual(seeds('w1.json'));
  });

  it('a model file read and written again gives the same bytes, and scores from it are identical', () => {
    const text = readFileSync(p('model.json'), 'utf8');
    const file = parseModel(text, 'model.json');
    expect(formatModel(file)).toBe(text);
    const runs = runsFromCsv(readFileSync(p('runs.csv'), 'utf8'), 'runs.csv', { surfaces }).runs;
    const again = parseModel(formatModel(file), 'again.json');
    expect(emIteration(again.model, runs, { priorStrength: 0 }).logLik).toBe(emIteration(file.model, runs, { priorStrength: 0 }).logLik);
  });
});
