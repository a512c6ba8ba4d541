import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';
import { buildModel } from '../../src/model/build-model.js';
import { formatModel } from '../../src/io/format-model.js';
import { parseModel } from '../../src/io/parse-model.js';
import { parseCsv, type CsvTable } from '../../src/io/parse-csv.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';

// An invented 7 × 3 building: a west room (columns 0–2), a hall (column 3), an east room (columns 4–6);
// the hall's south cell has no zone. Surfaces repeat so that single cells are hard to tell apart but
// rooms are not. The truth model's rows are drawn around the survey (look-alike confusion).
const surfaces = ['oak', 'carpet', 'tile'];
const base = gridFloor(7, 3, surfaces, (x, y) => (x < 3 ? (x + y) % 2 : x === 3 ? 2 : 1 + ((x + y) % 2)), 'zoned test building');
const zoneOf = (x: number, y: number): string | undefined => (x < 3 ? 'West room' : x === 3 ? (y === 0 ? undefined : 'Hall') : 'East room');
const floor: FloorGraph = {
  ...base,
  cells: base.cells.map((c) => {
    const [, x, y] = c.id.split('-').map(Number);
    const zone = zoneOf(x, y);
    return zone === undefined ? c : { ...c, zone };
  }),
  georeference: { lat: 12.5, lon: -40.25, bearing: 90 },
};
const truth = buildModel(floor, { dwell: 0.6, hit: 0.8 });
{
  const rng = new SeededRandom(7);
  const m = surfaces.length;
  for (let i = 0; i < floor.cells.length; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(40 * (r === surfaces.indexOf(floor.cells[i].surface) ? 0.8 : 0.1));
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
}
const zoneOfCell = new Map(floor.cells.map((c) => [c.id, c.zone ?? ''] as const));
const cellOf = new Map(floor.cells.map((c) => [c.id, c] as const));

const tmp = tempDir();
const p = tmp.path;

function table(path: string): { t: CsvTable; col: (name: string) => (row: number) => string } {
  const t = parseCsv(readFileSync(path, 'utf8'), path);
  return {
    t,
    col: (name) => {
      const k = t.header.indexOf(name);
      if (k < 0) throw new Error(`${path}: no column ${name}`);
      return (row) => t.columns[k].get(row) ?? '';
    },
  };
}

/** Share of rows whose `column` names the true cell's zone (empty for the cell without a zone). */
function zoneAccuracy(path: string, column: string): number {
  const { t, col } = table(path);
  const truthCol = col('true_cell');
  const zone = col(column);
  let hit = 0;
  for (let r = 0; r < t.nRows; r++) if (zone(r) === zoneOfCell.get(truthCol(r))) hit++;
  return hit / t.nRows;
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  writeFileSync(p('truth.json'), formatModel({ name: 'truth', model: truth, fit: null }));
  const sim = runCli(['simulate', '--floor', p('floor.json'), '--model', p('truth.json'), '--runs', '40', '--steps', '300', '--seed', '3', '--dropout-rate', '0.03', '--out', p('runs.csv')]);
  expect(sim.code, sim.stderr).toBe(0);
  // The truth moves as a `tied` model does; fitting in that mode keeps both restarts on it (`auto` would
  // share two restarts among four modes, one each), so the comparison is about zones, not about modes.
  const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('fit.json'), '--restarts', '2', '--transitions', 'tied', '--workers', '1', '--quiet']);
  expect(fit.code, fit.stderr).toBe(0);
  for (const which of ['truth', 'fit']) {
    const dec = runCli(['decode', '--model', p(`${which}.json`), '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p(`${which}-annotated.csv`), '--summary', p(`${which}-summary.csv`)]);
    expect(dec.code, dec.stderr).toBe(0);
  }
});
afterAll(() => tmp.remove());

describe('zones through the built command', () => {
  it('the fitted model file carries the floor\'s zones (and nothing for a cell without one)', () => {
    const text = readFileSync(p('fit.json'), 'utf8');
    const model = parseModel(text, 'fit.json').model;
    expect(model.cells.map((c) => c.zone ?? null)).toEqual(floor.cells.map((c) => c.zone ?? null));
    expect(text).not.toContain('"georeference"');
    expect(formatModel(parseModel(text, 'fit.json'))).toBe(text);
  });

  it('zone and position columns are present and consistent with the path and posterior columns', () => {
    const { t, col } = table(p('fit-annotated.csv'));
    const [pathCell, pathP, likelyP, pathZone, likelyZone, zoneP, pathX, pathY, pathLevel, meanX, meanY, spread, meanLevel] = [
      'path_cell', 'path_p', 'likely_p', 'path_zone', 'likely_zone', 'zone_p', 'path_x', 'path_y', 'path_level', 'mean_x', 'mean_y', 'spread_m', 'mean_level',
    ].map(col);
    expect(t.header.slice(t.header.indexOf('flag'))).toEqual(['flag', 'path_zone', 'likely_zone', 'zone_p', 'path_x', 'path_y', 'path_level', 'mean_x', 'mean_y', 'spread_m', 'mean_level', 'flag_dropout', 'flag_low_confidence', 'flag_surprising', 'flag_impossible']);
    const zones = new Set(['', 'West room', 'Hall', 'East room']);
    let emptyLikely = 0;
    for (let r = 0; r < t.nRows; r++) {
      const cell = cellOf.get(pathCell(r))!;
      expect(pathZone(r)).toBe(cell.zone ?? '');
      expect(Number(pathX(r))).toBe(cell.x);
      expect(Number(pathY(r))).toBe(cell.y);
      expect(Number(pathLevel(r))).toBe(0);
      expect(Number(meanLevel(r))).toBe(0);
      expect(zones.has(likelyZone(r))).toBe(true);
      if (likelyZone(r) === '') emptyLikely++;
      // The most likely area holds at least the most likely cell's and the path cell's posterior.
      expect(Number(zoneP(r))).toBeGreaterThanOrEqual(Number(likelyP(r)) - 1e-12);
      expect(Number(zoneP(r))).toBeGreaterThanOrEqual(Number(pathP(r)) - 1e-12);
      expect(Number(zoneP(r))).toBeLessThanOrEqual(1 + 1e-12);
      // The mean lies inside the building's extent; the spread is at most its diagonal.
      expect(Number(meanX(r))).toBeGreaterThanOrEqual(0.5);
      expect(Number(meanX(r))).toBeLessThanOrEqual(6.5);
      expect(Number(meanY(r))).toBeGreaterThanOrEqual(0.5);
      expect(Number(meanY(r))).toBeLessThanOrEqual(2.5);
      expect(Number(spread(r))).toBeGreaterThanOrEqual(0);
      expect(Number(spread(r))).toBeLessThanOrEqual(Math.hypot(6, 2));
    }
    expect(emptyLikely).toBeLessThan(t.nRows);
    // The run summary: mean_zone_p is the mean of zone_p over the run's steps; low_confidence_zone_steps counts zone_p < 0.5.
    const s = table(p('fit-summary.csv'));
    expect(s.t.header).toEqual(expect.arrayContaining(['gap_steps', 'mean_zone_p', 'low_confidence_zone_steps']));
    const runCol = col('run');
    for (let k = 0; k < s.t.nRows; k++) {
      const run = s.col('run')(k);
      const ps: number[] = [];
      for (let r = 0; r < t.nRows; r++) if (runCol(r) === run) ps.push(Number(zoneP(r)));
      expect(Number(s.col('gap_steps')(k))).toBe(0);
      expectClose(Number(s.col('mean_zone_p')(k)), ps.reduce((a, b) => a + b, 0) / ps.length, { abs: 1e-12 }, `mean_zone_p ${run}`);
      expect(Number(s.col('low_confidence_zone_steps')(k))).toBe(ps.filter((v) => v < 0.5).length);
    }
  });

  it('zone accuracy of the fitted model is within 2 percentage points of the true model\'s, and above cell accuracy', () => {
    const fitted = zoneAccuracy(p('fit-annotated.csv'), 'likely_zone');
    const true_ = zoneAccuracy(p('truth-annotated.csv'), 'likely_zone');
    console.log(`likely_zone right: fitted model ${(100 * fitted).toFixed(1)} %, true model ${(100 * true_).toFixed(1)} %`);
    expect(Math.abs(fitted - true_), `fitted ${fitted}, truth ${true_}`).toBeLessThanOrEqual(0.02);
    const { t, col } = table(p('fit-annotated.csv'));
    let cellHits = 0;
    for (let r = 0; r < t.nRows; r++) if (col('likely_cell')(r) === col('true_cell')(r)) cellHits++;
    console.log(`likely_cell right (fitted model): ${((100 * cellHits) / t.nRows).toFixed(1)} %`);
    expect(fitted).toBeGreaterThan(cellHits / t.nRows);
    const pathZoneFit = zoneAccuracy(p('fit-annotated.csv'), 'path_zone');
    const pathZoneTruth = zoneAccuracy(p('truth-annotated.csv'), 'path_zone');
    expect(Math.abs(pathZoneFit - pathZoneTruth), `path_zone: fitted ${pathZoneFit}, truth ${pathZoneTruth}`).toBeLessThanOrEqual(0.02);
  });

  it('a model without zones keeps every column, the zone columns empty', () => {
    const plain = { ...truth, cells: truth.cells.map(({ zone: _z, ...c }) => c) };
    const text = formatModel({ name: 'plain', model: plain, fit: null });
    expect(text).not.toContain('"zone"');
    writeFileSync(p('plain.json'), text);
    const dec = runCli(['decode', '--model', p('plain.json'), '--runs', p('runs.csv'), '--out', p('plain-annotated.csv'), '--summary', p('plain-summary.csv')]);
    expect(dec.code, dec.stderr).toBe(0);
    const { t, col } = table(p('plain-annotated.csv'));
    for (let r = 0; r < t.nRows; r++) {
      expect([col('path_zone')(r), col('likely_zone')(r), col('zone_p')(r)]).toEqual(['', '', '']);
      expect(col('mean_x')(r)).not.toBe('');
    }
    const s = table(p('plain-summary.csv'));
    expect(s.col('mean_zone_p')(0)).toBe('');
    expect(s.col('low_confidence_zone_steps')(0)).toBe('');
    // With --floor the floor's zones are used (zones are labels; no re-fit needed to redraw them).
    const withFloor = runCli(['decode', '--model', p('plain.json'), '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('plain-floor-annotated.csv')]);
    expect(withFloor.code, withFloor.stderr).toBe(0);
    const z = table(p('plain-floor-annotated.csv'));
    for (let r = 0; r < z.t.nRows; r++) expect(z.col('path_zone')(r)).toBe(zoneOfCell.get(z.col('path_cell')(r)));
  });

  it('a model file whose zone is not a non-empty string: one line, exit 2, nothing written', () => {
    const text = readFileSync(p('fit.json'), 'utf8').replace('"zone": "Hall"', '"zone": 7');
    expect(text).toContain('"zone": 7');
    writeFileSync(p('bad-model.json'), text);
    const r = runCli(['decode', '--model', p('bad-model.json'), '--runs', p('runs.csv'), '--out', p('bad-model-annotated.csv')]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toEqual([`underfoot: ${p('bad-model.json')}: cell "g-3-1": "zone" must be a non-empty string of well-formed text, got 7`]);
    expect(existsSync(p('bad-model-annotated.csv'))).toBe(false);
  });

  it('check lists the zones with their cell counts and the georeference', () => {
    const r = runCli(['check', '--floor', p('floor.json')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('3 zones (cell counts): West room (9) · East room (9) · Hall (2)\n');
    expect(r.stdout).toContain('no zone (1, each its own area)');
    expect(r.stdout).toContain('12.5° lat, -40.25° lon');
    const json = JSON.parse(runCli(['check', '--floor', p('floor.json'), '--json']).stdout);
    expect(json.floor.zones).toEqual([
      { zone: 'West room', cells: 9, parts: 1 },
      { zone: 'East room', cells: 9, parts: 1 },
      { zone: 'Hall', cells: 2, parts: 1 },
    ]);
    expect(json.floor.unzonedCells).toBe(1);
    expect(json.georeference).toEqual({ lat: 12.5, lon: -40.25, bearing: 90 });
  });

  it('check warns about a zone in parts that do not touch', () => {
    const split = { ...floor, cells: floor.cells.map((c) => (c.id === 'g-6-2' || c.id === 'g-6-1' ? { ...c, zone: 'West room' } : c)) };
    writeFileSync(p('split.json'), JSON.stringify(split));
    const r = runCli(['check', '--floor', p('split.json')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('West room (11, 2 parts)');
    expect(r.stdout).toContain('! zone "West room" falls into 2 parts that do not touch (9, 2 cells); cells outside its largest part: "g-6-1", "g-6-2"');
  });
});

describe('bad zones and georeferences', () => {
  const cases: Array<[string, (f: Record<string, unknown>) => void, string]> = [
    ['a zone that is not a string', (f) => ((f.cells as Array<Record<string, unknown>>)[4].zone = 3), 'cell "g-4-0" (cells[4]) "zone" must be a non-empty string of well-formed text, got 3'],
    ['an empty zone', (f) => ((f.cells as Array<Record<string, unknown>>)[0].zone = ''), 'cell "g-0-0" (cells[0]) "zone" must be a non-empty string of well-formed text, got ""'],
    ['a latitude out of range', (f) => (f.georeference = { lat: 91, lon: 0, bearing: 0 }), '"georeference" "lat" must be a number of degrees in [-90, 90], got 91'],
    ['a bearing of 360', (f) => (f.georeference = { lat: 0, lon: 0, bearing: 360 }), '"georeference" "bearing" must be a number of degrees in [0, 360) (the x axis, clockwise from north), got 360'],
    ['a longitude as text', (f) => (f.georeference = { lat: 0, lon: '7', bearing: 0 }), '"georeference" "lon" must be a number of degrees in [-180, 180], got "7"'],
    ['a georeference without a bearing', (f) => (f.georeference = { lat: 0, lon: 0 }), '"georeference" "bearing" must be a number of degrees in [0, 360) (the x axis, clockwise from north), got nothing'],
    ['an unknown georeference key', (f) => (f.georeference = { lat: 0, lon: 0, bearing: 0, alt: 3 }), '"georeference" key must be one of "lat", "lon", "bearing", got "alt"'],
    ['a georeference that is a list', (f) => (f.georeference = [1, 2, 3]), '"georeference" must be an object with "lat", "lon" and "bearing", got [1,2,3]'],
  ];
  for (const [what, damage, message] of cases) {
    it(`${what}: one line, exit 2, nothing written`, () => {
      const doc = JSON.parse(JSON.stringify(floor)) as Record<string, unknown>;
      damage(doc);
      const bad = p(`bad-${what.replace(/\W+/g, '-')}.json`);
      writeFileSync(bad, JSON.stringify(doc));
      const out = p(`bad-${what.replace(/\W+/g, '-')}.csv`);
      const r = runCli(['simulate', '--floor', bad, '--runs', '2', '--steps', '5', '--seed', '1', '--out', out]);
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split('\n')).toEqual([`underfoot: ${bad}: ${message}`]);
      expect(existsSync(out)).toBe(false);
    });
  }
});
