/**
 * How close decoded cells are to the true ones in annotated tables that carry `true_cell` (simulated
 * runs): the share of steps whose `path_cell` / `likely_cell` is exactly the true cell, within 1.5 m of
 * it (cell centres on the same level), and in the true cell's zone. Used for the demo's odometry
 * figures (README).
 *
 *     node dist/bench/odometry-accuracy.js FLOOR.json ANNOTATED.csv [ANNOTATED.csv …]
 */
import { readFileSync } from 'node:fs';
import { parseFloor } from '../src/io/parse-floor.js';
import { annotatedAccuracy, accuracyRow, ACCURACY_HEADER } from './annotated-accuracy.js';

const [floorPath, ...tables] = process.argv.slice(2);
if (!floorPath || tables.length === 0) {
  process.stderr.write('odometry-accuracy: usage: odometry-accuracy FLOOR.json ANNOTATED.csv [ANNOTATED.csv …]\n');
  process.exit(2);
}
const floor = parseFloor(readFileSync(floorPath, 'utf8'), floorPath);
process.stdout.write(`${ACCURACY_HEADER}\n`);
for (const path of tables) process.stdout.write(`${accuracyRow(path.split('/').pop()!, annotatedAccuracy(floor, readFileSync(path, 'utf8'), path))}\n`);
