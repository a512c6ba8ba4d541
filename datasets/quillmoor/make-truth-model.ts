/**
 * Makes the "true" sensor model of the invented Quillmoor Arts Centre, from which the demo runs are
 * simulated: transitions from the floor graph (dwell 0.6), and per cell an emission row drawn around
 * the invented confusion row of its surveyed surface (Dirichlet, concentration 300), with a few "worn"
 * cells (about 1 in 20) whose row is pulled towards a look-alike surface. Deterministic (seed 2026).
 * Its movement parameters (wheel odometry, DEVELOPERS.md "Movement") are the maximum-likelihood values
 * for a long walk simulated from these transitions with the odometry noise of `simulate` (seed 2027):
 * the staying probability's logistic in the distance moved, and the heading concentration κ.
 *
 *   npx tsx datasets/quillmoor/make-truth-model.ts
 *
 * then (the command that made runs.csv; a model with movement parameters makes `simulate` write the
 * `moved` and `heading` columns, from a generator of their own, so the walk and readings are those of
 * the same seed without them):
 *
 *   node dist/src/cli/bin.js simulate --floor datasets/quillmoor/floor.json \
 *     --model datasets/quillmoor/truth-model.json --runs 60 --steps 600 --seed 11 \
 *     --dropout-rate 0.02 --gap-rate 0.005 --out datasets/quillmoor/runs.csv
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseFloor } from '../../src/io/parse-floor.js';
import { formatModel } from '../../src/io/format-model.js';
import { parseModel } from '../../src/io/parse-model.js';
import { buildModel } from '../../src/model/build-model.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { sampleOdometry } from '../../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';
import { maximizeMovement } from '../../src/model/maximize-movement.js';
import { DEFAULT_MOVEMENT } from '../../src/model/default-movement.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { linkBearings } from '../../src/model/link-bearings.js';
import { emptyMoveAccumulators } from '../../src/model/expected-counts-table.js';

const here = (name: string): string => fileURLToPath(new URL(name, import.meta.url));
const floor = parseFloor(readFileSync(here('./floor.json'), 'utf8'), 'floor.json');
const confusion = JSON.parse(readFileSync(here('./sensor-confusion.json'), 'utf8')) as {
  surfaces: string[];
  rows: Record<string, Record<string, number>>;
};
const LOOK_ALIKE: Record<string, string> = { oak: 'laminate', laminate: 'oak', tile: 'concrete', concrete: 'tile', carpet: 'rubber', rubber: 'carpet' };

const model = buildModel(floor, { dwell: 0.6, hit: 0.8 });
const rng = new SeededRandom(2026);
const m = floor.surfaces.length;
let worn = 0;
floor.cells.forEach((cell, i) => {
  const base = floor.surfaces.map((s) => confusion.rows[cell.surface][s]);
  if (rng.next() < 0.05) {
    // Worn or partly covered: a third of the readings look like the look-alike surface.
    const other = floor.surfaces.indexOf(LOOK_ALIKE[cell.surface]);
    for (let r = 0; r < m; r++) base[r] = (2 / 3) * base[r] + (r === other ? 1 / 3 : 0);
    worn++;
  }
  let sum = 0;
  const row = base.map((p) => {
    const g = Math.max(1e-4, rng.gamma(300 * p));
    sum += g;
    return g;
  });
  row.forEach((g, r) => (model.emission[i * m + r] = g / sum));
});
// Movement parameters: complete-data maximum likelihood on a simulated walk (true cells known).
{
  const walkRng = new SeededRandom(2027);
  const chain = chainFromModel(model);
  const n = chain.nCells;
  const bearings = linkBearings(model.structure, model.cells);
  const cosOf = (q: number): number => (Number.isNaN(bearings[q]) ? 0 : Math.cos(bearings[q]));
  const sinOf = (q: number): number => (Number.isNaN(bearings[q]) ? 0 : Math.sin(bearings[q]));
  const acc = emptyMoveAccumulators(n);
  for (let w = 0; w < 20; w++) {
    const { cells } = sampleRun(model, 2000, walkRng);
    const od = sampleOdometry(model, cells, walkRng);
    const { dBin, hBin } = moveStepsFromOdometry(od.moved, od.heading);
    for (let t = 1; t < cells.length; t++) {
      const i = cells[t - 1];
      const j = cells[t];
      if (i === j) acc.stayByDistance[dBin[t]] += 1;
      else {
        acc.moveByDistance[dBin[t]] += 1;
        if (hBin[t] >= 0) {
          let q = chain.outPtr[i];
          while (chain.outIdx[q] !== j) q++;
          acc.moveByHeading[hBin[t] * n + i] += 1;
          acc.headingCos[hBin[t]] += cosOf(q);
          acc.headingSin[hBin[t]] += sinOf(q);
        }
      }
    }
  }
  model.movement = maximizeMovement(model, DEFAULT_MOVEMENT, acc);
}
const text = formatModel({ name: `${floor.name} — simulation truth`, model, fit: null });
parseModel(text, 'truth-model.json'); // the project's own reader must accept it
writeFileSync(here('./truth-model.json'), text);
console.log(`wrote truth-model.json: ${floor.cells.length} cells, ${worn} worn cells, movement ${JSON.stringify(model.movement)}`);
