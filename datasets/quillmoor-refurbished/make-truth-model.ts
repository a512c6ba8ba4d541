/**
 * The invented Quillmoor Arts Centre after an (invented) refurbishment: the same floor graph, but
 *   - carpet laid over the oak in the gallery's south-west corner (6 cells, L0-GAL-00…02-00…01),
 *   - the west end of the ground-floor corridor re-tiled (6 cells, L0-COR-00…05-00, oak → tile),
 *   - a rubber mat laid on the first-floor corridor by the lift (2 cells, L1-COR-08…09-00, laminate → rubber).
 * Every other cell keeps its row from ../quillmoor/truth-model.json. A changed cell's row is drawn around
 * the invented confusion row of its new surface (Dirichlet, concentration 300, seed 2027). The survey in
 * ../quillmoor/floor.json still shows the old surfaces: finding the 14 changed cells is `compare`'s job.
 *
 *   npx tsx datasets/quillmoor-refurbished/make-truth-model.ts
 *
 * then (the command that made runs.csv):
 *
 *   node dist/src/cli/bin.js simulate --floor datasets/quillmoor/floor.json \
 *     --model datasets/quillmoor-refurbished/truth-model.json --runs 60 --steps 600 --seed 12 \
 *     --dropout-rate 0.02 --gap-rate 0.005 --odometry --out datasets/quillmoor-refurbished/runs.csv
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseModel } from '../../src/io/parse-model.js';
import { formatModel } from '../../src/io/format-model.js';
import { SeededRandom } from '../../src/model/seeded-random.js';

const here = (name: string): string => fileURLToPath(new URL(name, import.meta.url));
const before = parseModel(readFileSync(here('../quillmoor/truth-model.json'), 'utf8'), 'truth-model.json');
const confusion = JSON.parse(readFileSync(here('../quillmoor/sensor-confusion.json'), 'utf8')) as { rows: Record<string, Record<string, number>> };
const changes: Record<string, string> = {};
for (const x of [0, 1, 2]) for (const y of [0, 1]) changes[`L0-GAL-0${x}-0${y}`] = 'carpet';
for (let x = 0; x <= 5; x++) changes[`L0-COR-0${x}-00`] = 'tile';
changes['L1-COR-08-00'] = 'rubber';
changes['L1-COR-09-00'] = 'rubber';

const model = before.model;
const m = model.surfaces.length;
const rng = new SeededRandom(2027);
const changed: string[] = [];
model.cells.forEach((cell, i) => {
  const to = changes[cell.id];
  if (!to) return;
  const draws = model.surfaces.map((s) => Math.max(1e-4, rng.gamma(300 * confusion.rows[to][s])));
  const sum = draws.reduce((a, b) => a + b, 0);
  draws.forEach((g, r) => (model.emission[i * m + r] = g / sum));
  changed.push(`${cell.id}: ${cell.surface} → ${to}`);
});
if (changed.length !== Object.keys(changes).length) throw new Error('make-truth-model: a refurbished cell id is not in the floor');
const text = formatModel({ name: 'Quillmoor Arts Centre after refurbishment — simulation truth', model, fit: null });
parseModel(text, 'truth-model.json');
writeFileSync(here('./truth-model.json'), text);
writeFileSync(here('./changed-cells.txt'), `${changed.join('\n')}\n`);
console.log(`wrote truth-model.json and changed-cells.txt: ${changed.length} changed cells`);
