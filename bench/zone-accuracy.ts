/**
 * How often decoding finds the true cell and the true zone, on simulated runs with a `true_cell` column:
 *
 *   node dist/bench/zone-accuracy.js FLOOR RUNS MODEL [MODEL …]
 *
 * Every model is decoded with the floor's zones (as `decode --floor` does). Printed per model: the share
 * of steps whose `path_cell` / `likely_cell` is the true cell, whose `path_zone` / `likely_zone` is the
 * true cell's zone, and the mean `likely_p` and `zone_p`. Steps are the input rows (gap steps have none).
 */
import { readFloor } from '../src/io/read-floor.js';
import { readModel } from '../src/io/read-model.js';
import { loadRuns } from '../src/pipeline/load-runs.js';
import { decodeRuns } from '../src/pipeline/decode-runs.js';
import { checkModelFloor } from '../src/model/check-model-floor.js';
import { withFloorZones } from '../src/model/with-floor-zones.js';

const [floorPath, runsPath, ...modelPaths] = process.argv.slice(2);
if (!floorPath || !runsPath || modelPaths.length === 0) {
  console.error('usage: node dist/bench/zone-accuracy.js FLOOR RUNS MODEL [MODEL …]');
  process.exit(2);
}
const floor = await readFloor(floorPath);
const zoneOfCell = new Map(floor.cells.map((c) => [c.id, c.zone ?? null] as const));
const loaded = await loadRuns([runsPath], { surfaces: floor.surfaces, runCol: 'run', stepCol: 'step', readingCol: 'reading', unknownReadings: 'error' });
console.log('model                          steps  path_cell  likely_cell  path_zone  likely_zone  mean likely_p  mean zone_p');
for (const path of modelPaths) {
  const file = await readModel(path);
  checkModelFloor(file.model, path, floor, floorPath);
  const model = withFloorZones(file.model, floor);
  const { annotated } = decodeRuns(model, loaded.tables, { lowConfidence: 0.5, surprisingBits: 6 }, () => 'unseen');
  const col = (name: string) => {
    const c = annotated.columns.find((k) => k.name === name);
    if (!c) throw new Error(`no column ${name}`);
    return c.get;
  };
  const truth = col('true_cell');
  const [pathCell, likelyCell, pathZone, likelyZone, likelyP, zoneP] = ['path_cell', 'likely_cell', 'path_zone', 'likely_zone', 'likely_p', 'zone_p'].map(col);
  const hits = [0, 0, 0, 0];
  let sumLikelyP = 0;
  let sumZoneP = 0;
  let n = 0;
  for (let row = 0; row < annotated.nRows; row++) {
    const cell = String(truth(row));
    const zone = zoneOfCell.get(cell) ?? null;
    n++;
    if (pathCell(row) === cell) hits[0]++;
    if (likelyCell(row) === cell) hits[1]++;
    if (pathZone(row) === zone) hits[2]++;
    if (likelyZone(row) === zone) hits[3]++;
    sumLikelyP += Number(likelyP(row));
    sumZoneP += Number(zoneP(row));
  }
  const pct = (k: number) => `${((100 * k) / n).toFixed(1)} %`.padStart(9);
  console.log(
    `${path.slice(-30).padEnd(30)} ${String(n).padStart(6)}  ${pct(hits[0])}  ${pct(hits[1])}    ${pct(hits[2])}  ${pct(hits[3])}    ${(sumLikelyP / n).toFixed(3).padStart(11)}  ${(sumZoneP / n).toFixed(3).padStart(11)}`,
  );
}
