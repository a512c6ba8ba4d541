/**
 * What zones and wheel odometry buy, on a second invented building (the demo's figures are in the
 * README): "Harrowgate Depot", one level of 14 × 7 one-metre cells — two storage bays of the same
 * carpet side by side, an oak office, a laminate canteen and a concrete workshop, joined by a tiled
 * corridor through one doorway each; every room is a zone. Invented, like all our demo data.
 *
 *     npm run build && node dist/bench/position-figures.js [--runs 40] [--steps 500] [--restarts 4]
 *         [--fit-option='--prior-strength 50'] [--keep]
 *
 * Runs are simulated with the built command from a truth model (dwell 0.6, readings hit 0.8, the demo
 * truth's movement parameters, which depend only on the simulated odometry noise); the same runs with
 * the odometry columns removed are the "without" case. Fitted with and without odometry (default
 * options), decoded with the fitted and with the true model; printed: exact cell, within 1.5 m and zone
 * accuracy of `path_cell` and `likely_cell` against `true_cell`, and the wall time of each fit.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import type { FloorCell, FloorGraph, FloorLink } from '../src/model/floor-graph.js';
import { buildModel } from '../src/model/build-model.js';
import { formatModel } from '../src/io/format-model.js';
import { annotatedAccuracy, accuracyRow, ACCURACY_HEADER } from './annotated-accuracy.js';

const { values } = parseArgs({ options: { runs: { type: 'string', default: '40' }, steps: { type: 'string', default: '500' }, restarts: { type: 'string', default: '4' }, keep: { type: 'boolean', default: false }, 'fit-option': { type: 'string', multiple: true, default: [] } } });
const bin = fileURLToPath(new URL('../src/cli/bin.js', import.meta.url));

/** The invented depot: rooms as [zone, surface, x0, x1, y0, y1, door x, door side]. */
function depotFloor(): FloorGraph {
  const rooms: Array<[string, string, number, number, number, number, number]> = [
    ['Bay A', 'carpet', 0, 4, 0, 2, 2],
    ['Bay B', 'carpet', 5, 9, 0, 2, 7],
    ['Office', 'oak', 10, 13, 0, 2, 11],
    ['Canteen', 'laminate', 0, 6, 4, 6, 3],
    ['Workshop', 'concrete', 7, 13, 4, 6, 10],
  ];
  const cells: FloorCell[] = [];
  const links: FloorLink[] = [];
  const id = (x: number, y: number): string => `D-${String(x).padStart(2, '0')}-${y}`;
  const at = new Map<string, FloorCell>();
  const add = (x: number, y: number, surface: string, zone: string): void => {
    const c: FloorCell = { id: id(x, y), surface, x: x + 0.5, y: y + 0.5, level: 0, start: zone === 'Corridor' && x === 0, zone };
    cells.push(c);
    at.set(c.id, c);
  };
  for (const [zone, surface, x0, x1, y0, y1] of rooms) for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) add(x, y, surface, zone);
  for (let x = 0; x <= 13; x++) add(x, 3, 'tile', 'Corridor');
  const link = (a: string, b: string): void => {
    if (at.has(a) && at.has(b)) links.push({ from: a, to: b, oneway: false });
  };
  for (const [zone, , x0, x1, y0, y1, door] of rooms) {
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        if (x < x1) link(id(x, y), id(x + 1, y));
        if (y < y1) link(id(x, y), id(x, y + 1));
      }
    }
    link(id(door, zone === 'Canteen' || zone === 'Workshop' ? 4 : 2), id(door, 3));
  }
  for (let x = 0; x < 13; x++) link(id(x, 3), id(x + 1, 3));
  return { format: 'underfoot-floor/1', name: 'Harrowgate Depot (invented)', surfaces: ['carpet', 'oak', 'laminate', 'concrete', 'tile'], cells, links };
}

const dir = mkdtempSync(join(tmpdir(), 'underfoot-positions-'));
const p = (name: string): string => join(dir, name);
const cli = (args: string[]): number => {
  const t0 = performance.now();
  execFileSync(process.execPath, [bin, ...args, '--quiet'], { stdio: ['ignore', 'ignore', 'inherit'] });
  return (performance.now() - t0) / 1000;
};
try {
  const floor = depotFloor();
  writeFileSync(p('floor.json'), JSON.stringify(floor, null, 1));
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.8 });
  const demoTruth = JSON.parse(readFileSync(fileURLToPath(new URL('../../datasets/quillmoor/truth-model.json', import.meta.url)), 'utf8')) as { movement: typeof truth.movement };
  truth.movement = demoTruth.movement;
  writeFileSync(p('truth.json'), formatModel({ name: 'Harrowgate Depot — simulation truth', model: truth, fit: null }));
  cli(['simulate', '--floor', p('floor.json'), '--model', p('truth.json'), '--runs', values.runs!, '--steps', values.steps!, '--seed', '21', '--dropout-rate', '0.02', '--gap-rate', '0.005', '--out', p('odo.csv')]);
  // The same runs without the odometry columns.
  const lines = readFileSync(p('odo.csv'), 'utf8').split('\n');
  const header = lines[0].split(',');
  const keep = header.map((h, k) => (h === 'moved' || h === 'heading' ? -1 : k)).filter((k) => k >= 0);
  writeFileSync(p('plain.csv'), lines.map((l) => (l === '' ? l : keep.map((k) => l.split(',')[k]).join(','))).join('\n'));
  const fitArgs = ['--floor', p('floor.json'), '--restarts', values.restarts!, ...values['fit-option']!.flatMap((o) => o.split(' '))];
  const fitOdo = cli(['fit', ...fitArgs, '--runs', p('odo.csv'), '--out', p('fit-odo.json')]);
  const fitPlain = cli(['fit', ...fitArgs, '--runs', p('plain.csv'), '--out', p('fit-plain.json')]);
  const cases: Array<[string, string, string]> = [
    ['fitted, with odometry', 'fit-odo.json', 'odo.csv'],
    ['fitted, without', 'fit-plain.json', 'plain.csv'],
    ['truth, with odometry', 'truth.json', 'odo.csv'],
    ['truth, without', 'truth.json', 'plain.csv'],
  ];
  console.log(`${floor.name}: ${floor.cells.length} cells, ${values.runs} runs × ${values.steps} steps; fit ${values.restarts} restarts: ${fitOdo.toFixed(0)} s with odometry, ${fitPlain.toFixed(0)} s without`);
  console.log(ACCURACY_HEADER);
  for (const [label, model, runs] of cases) {
    const out = p(`${label.replace(/[^a-z]+/g, '-')}.csv`);
    cli(['decode', '--model', p(model), '--floor', p('floor.json'), '--runs', p(runs), '--out', out]);
    console.log(accuracyRow(label, annotatedAccuracy(floor, readFileSync(out, 'utf8'), out)));
  }
} finally {
  if (values.keep) console.log(`kept ${dir}`);
  else rmSync(dir, { recursive: true, force: true });
}
