import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { parseCsv } from '../../src/io/parse-csv.js';
import { parseModel } from '../../src/io/parse-model.js';

// An invented 6 × 4 floor whose surfaces repeat in stripes, so readings alone leave the position
// ambiguous along a stripe; wheel odometry tells moves from stays and their direction.
const surfaces = ['oak', 'carpet', 'tile'];
const floor = gridFloor(6, 4, surfaces, (x) => x % 3, 'odometry test floor');

const tmp = tempDir();
const p = tmp.path;
const fixture = (name: string): string => fileURLToPath(new URL(`../fixtures/no-movement/${name}`, import.meta.url));

function ok(args: string[]): string {
  const r = runCli(args);
  expect(r.code, r.stderr).toBe(0);
  return r.stdout;
}

function accuracy(annotated: string, column: string): number {
  const t = parseCsv(readFileSync(annotated, 'utf8'), annotated);
  const truth = t.columns[t.header.indexOf('true_cell')];
  const col = t.columns[t.header.indexOf(column)];
  let hit = 0;
  for (let r = 0; r < t.nRows; r++) if (truth.get(r) === col.get(r)) hit++;
  return hit / t.nRows;
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  const common = ['simulate', '--floor', p('floor.json'), '--runs', '24', '--steps', '300', '--seed', '9', '--dwell', '0.5', '--hit', '0.85', '--dropout-rate', '0.03', '--gap-rate', '0.01', '-q'];
  ok([...common, '--odometry', '--out', p('odo.csv')]);
  ok([...common, '--out', p('plain.csv')]);
});
afterAll(() => tmp.remove());

describe('movement (wheel odometry) through the built command', () => {
  it('simulate writes moved and heading columns; the walk is the same as without them (same seed)', () => {
    const odo = parseCsv(readFileSync(p('odo.csv'), 'utf8'), 'odo.csv');
    const plain = parseCsv(readFileSync(p('plain.csv'), 'utf8'), 'plain.csv');
    expect(odo.header).toEqual(['run', 'step', 'reading', 'moved', 'heading', 'true_cell']);
    expect(odo.nRows).toBe(plain.nRows);
    for (const name of ['run', 'step', 'reading', 'true_cell']) {
      const a = odo.columns[odo.header.indexOf(name)];
      const b = plain.columns[plain.header.indexOf(name)];
      for (let r = 0; r < odo.nRows; r++) expect(a.get(r)).toBe(b.get(r));
    }
  });

  it('decoding with odometry is more accurate than without (figures printed)', () => {
    ok(['fit', '--floor', p('floor.json'), '--runs', p('odo.csv'), '--out', p('odo-model.json'), '--restarts', '2', '--workers', '1', '-q']);
    ok(['fit', '--floor', p('floor.json'), '--runs', p('plain.csv'), '--out', p('plain-model.json'), '--restarts', '2', '--workers', '1', '-q']);
    const model = parseModel(readFileSync(p('odo-model.json'), 'utf8'), 'odo-model.json').model;
    expect(model.movement).toBeDefined();
    expect(parseModel(readFileSync(p('plain-model.json'), 'utf8'), 'plain-model.json').model.movement).toBeUndefined();
    ok(['decode', '--model', p('odo-model.json'), '--runs', p('odo.csv'), '--out', p('odo-annotated.csv'), '-q']);
    ok(['decode', '--model', p('plain-model.json'), '--runs', p('plain.csv'), '--out', p('plain-annotated.csv'), '-q']);
    const figures = {
      pathWith: accuracy(p('odo-annotated.csv'), 'path_cell'),
      pathWithout: accuracy(p('plain-annotated.csv'), 'path_cell'),
      likelyWith: accuracy(p('odo-annotated.csv'), 'likely_cell'),
      likelyWithout: accuracy(p('plain-annotated.csv'), 'likely_cell'),
    };
    console.log(
      `odometry test floor: path_cell exact ${(100 * figures.pathWith).toFixed(1)} % with odometry vs ${(100 * figures.pathWithout).toFixed(1)} % without; ` +
        `likely_cell ${(100 * figures.likelyWith).toFixed(1)} % vs ${(100 * figures.likelyWithout).toFixed(1)} %`,
    );
    expect(figures.pathWith).toBeGreaterThan(figures.pathWithout + 0.05);
    expect(figures.likelyWith).toBeGreaterThan(figures.likelyWithout + 0.05);
  });

  it('--workers 1 and 2 write identical model bytes with movement columns', () => {
    ok(['fit', '--floor', p('floor.json'), '--runs', p('odo.csv'), '--out', p('w1.json'), '--restarts', '2', '--max-iter', '30', '--workers', '1', '-q']);
    ok(['fit', '--floor', p('floor.json'), '--runs', p('odo.csv'), '--out', p('w2.json'), '--restarts', '2', '--max-iter', '30', '--workers', '2', '-q']);
    expect(readFileSync(p('w2.json'), 'utf8')).toBe(readFileSync(p('w1.json'), 'utf8'));
  });

  it('a runs table without movement columns gives the same model bytes as before odometry support (committed fixture)', () => {
    // `--max-iter 200`: the default when the fixture was made (it is 1000 since issue 18).
    const r = runCli(['fit', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', p('fixture-model.json'), '--transitions', 'tied', '--restarts', '2', '--seed', '3', '--max-iter', '200', '--workers', '1', '-q'], fileURLToPath(new URL('../fixtures/no-movement/', import.meta.url)));
    expect(r.code, r.stderr).toBe(0);
    // The same release adds one key to the fit record, `predictiveCalibration` (the label-free forecast
    // check); everything else — every parameter, score and count — must be byte for byte as before.
    const now = JSON.parse(readFileSync(p('fixture-model.json'), 'utf8')) as { fit: Record<string, unknown> };
    expect(now.fit.predictiveCalibration).toBeDefined();
    delete now.fit.predictiveCalibration;
    const text = readFileSync(p('fixture-model.json'), 'utf8');
    const withoutCalibration = text.replace(/,\n {4}"predictiveCalibration": \{[\s\S]*?\n {4}\}(?=\n {2}\})/, '');
    expect(JSON.parse(withoutCalibration)).toEqual(now);
    expect(withoutCalibration).toBe(readFileSync(fixture('model.json'), 'utf8'));
  });

  it('--transitions learned ignores movement columns with a warning', () => {
    const r = runCli(['fit', '--floor', p('floor.json'), '--runs', p('odo.csv'), '--out', p('learned.json'), '--transitions', 'learned', '--restarts', '1', '--max-iter', '5', '--workers', '1']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr + r.stdout).toMatch(/odometry columns \(moved, heading\) are ignored with --transitions learned/);
    expect(parseModel(readFileSync(p('learned.json'), 'utf8'), 'learned.json').model.movement).toBeUndefined();
  });

  const bad: Array<[string, (line: string) => string, RegExp]> = [
    ['a negative distance', (l) => l.replace(/^(sim-002,5,[^,]*,)[^,]*,/, '$1-0.5,'), /moved at run "sim-002" step 5 must be a number >= 0 \(metres since the previous row\), got "-0.5"/],
    ['a distance that is not a number', (l) => l.replace(/^(sim-002,5,[^,]*,)[^,]*,/, '$1far,'), /moved at run "sim-002" step 5 must be a number >= 0 \(metres since the previous row\), got "far"/],
    ['a heading of 360°', (l) => l.replace(/^(sim-002,5,[^,]*,[^,]*,)[^,]*,/, '$1360,'), /heading at run "sim-002" step 5 must be a number in \[0, 360\) \(degrees\), got "360"/],
    ['a negative heading', (l) => l.replace(/^(sim-002,5,[^,]*,[^,]*,)[^,]*,/, '$1-10,'), /heading at run "sim-002" step 5 must be a number in \[0, 360\) \(degrees\), got "-10"/],
  ];
  for (const [what, damage, message] of bad) {
    it(`bad odometry: ${what} is one clear line naming run and step, exit 2, nothing written (fit, decode, check)`, () => {
      const lines = readFileSync(p('odo.csv'), 'utf8').split('\n');
      const damaged = lines.map(damage);
      expect(damaged).not.toEqual(lines);
      writeFileSync(p('bad.csv'), damaged.join('\n'));
      for (const args of [
        ['fit', '--floor', p('floor.json'), '--runs', p('bad.csv'), '--out', p('bad-model.json'), '--workers', '1'],
        ['decode', '--model', p('w1.json'), '--runs', p('bad.csv'), '--out', p('bad-annotated.csv')],
        ['check', '--floor', p('floor.json'), '--runs', p('bad.csv')],
      ]) {
        const r = runCli(args);
        expect(r.code, r.stderr).toBe(2);
        expect(r.stderr.trim().split('\n')).toHaveLength(1);
        expect(r.stderr).toMatch(message);
      }
      expect(existsSync(p('bad-model.json'))).toBe(false);
      expect(existsSync(p('bad-annotated.csv'))).toBe(false);
    });
  }

  it('--moved-col naming a missing column is an error', () => {
    const r = runCli(['fit', '--floor', p('floor.json'), '--runs', p('odo.csv'), '--out', p('x.json'), '--moved-col', 'odo_m', '--workers', '1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/the --moved-col column must exist, got no column "odo_m"/);
  });
});
