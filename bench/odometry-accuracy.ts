/**
 * How close decoded cells are to the true ones in annotated tables that carry `true_cell` (simulated
 * runs): the share of steps whose `path_cell` / `likely_cell` is exactly the true cell, and within
 * 1.5 m of it (cell centres on the same level). Used for the demo's odometry figures (README).
 *
 *     node dist/bench/odometry-accuracy.js FLOOR.json ANNOTATED.csv [ANNOTATED.csv …]
 */
import { readFileSync } from 'node:fs';
import { parseFloor } from '../src/io/parse-floor.js';
import { parseCsv } from '../src/io/parse-csv.js';

const [floorPath, ...tables] = process.argv.slice(2);
if (!floorPath || tables.length === 0) {
  process.stderr.write('odometry-accuracy: usage: odometry-accuracy FLOOR.json ANNOTATED.csv [ANNOTATED.csv …]\n');
  process.exit(2);
}
const floor = parseFloor(readFileSync(floorPath, 'utf8'), floorPath);
const byId = new Map(floor.cells.map((c) => [c.id, c] as const));
process.stdout.write(`${'table'.padEnd(28)} ${'path exact'.padStart(10)} ${'path ≤1.5m'.padStart(10)} ${'likely exact'.padStart(12)} ${'likely ≤1.5m'.padStart(12)}\n`);
for (const path of tables) {
  const t = parseCsv(readFileSync(path, 'utf8'), path);
  const col = (name: string) => t.columns[t.header.indexOf(name)];
  const truth = col('true_cell');
  const figures = ['path_cell', 'likely_cell'].flatMap((name) => {
    const c = col(name);
    let exact = 0;
    let near = 0;
    for (let r = 0; r < t.nRows; r++) {
      const a = byId.get(String(truth.get(r)));
      const b = byId.get(String(c.get(r)));
      if (!a || !b) continue;
      if (a.id === b.id) exact++;
      if (a.level === b.level && Math.hypot(a.x - b.x, a.y - b.y) <= 1.5) near++;
    }
    return [exact / t.nRows, near / t.nRows];
  });
  const pct = (x: number, w: number): string => `${(100 * x).toFixed(1)} %`.padStart(w);
  process.stdout.write(`${path.split('/').pop()!.padEnd(28)} ${pct(figures[0], 10)} ${pct(figures[1], 10)} ${pct(figures[2], 12)} ${pct(figures[3], 12)}\n`);
}
