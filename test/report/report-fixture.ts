import type { FloorGraph } from '../../src/model/floor-graph.js';
import type { FitRecord, LoopRecord } from '../../src/fit/fit-record.js';
import type { ReportInputs, RunRow } from '../../src/report/report-data.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { decodeRuns } from '../../src/pipeline/decode-runs.js';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { tableToCsv } from '../../src/io/table-to-csv.js';

/** Labels that would run script or break the page if they reached it unescaped. */
export const HOSTILE = {
  cell: '<img src=x onerror=alert(1)>',
  surface: '<b>tile</b>',
  run: '</td><script>alert(2)</script>',
  building: 'Quay & <Hall> "A" </title><script>alert(3)</script>',
  zone: '<b>West</b> & "wing" </text><script>alert(4)</script>',
};

/**
 * An invented two-level floor (a 4 × 3 ground floor, a 2 × 2 upper floor joined by a lift link, one
 * one-way link), its model with one cell that reads unlike its survey, a hand-made fit record (three
 * restarts, numbers invented), simulated runs decoded into an annotated table and a summary, and a
 * changes table — everything a report needs. The ground floor has two zones (columns 0–1 and 2–3);
 * the upper floor has none. `hostile` puts markup into every kind of label.
 */
export function reportFixture(hostile = false): ReportInputs & { floor: FloorGraph } {
  const surfaces = ['oak', 'carpet', hostile ? HOSTILE.surface : 'tile'];
  const cells: FloorGraph['cells'] = [];
  const links: FloorGraph['links'] = [];
  for (let y = 0; y < 3; y++) {
    for (let x = 0; x < 4; x++) {
      const id = hostile && x === 0 && y === 0 ? HOSTILE.cell : `G-${x}-${y}`;
      cells.push({ id, surface: surfaces[(x + y) % 3], x: x + 0.5, y: y + 0.5, level: 0, start: x === 0, zone: x < 2 ? (hostile ? HOSTILE.zone : 'West wing') : 'East wing' });
    }
  }
  const gid = (x: number, y: number) => cells[y * 4 + x].id;
  for (let y = 0; y < 3; y++) for (let x = 0; x < 4; x++) {
    if (x + 1 < 4) links.push({ from: gid(x, y), to: gid(x + 1, y), oneway: false });
    if (y + 1 < 3) links.push({ from: gid(x, y), to: gid(x, y + 1), oneway: false });
  }
  links.push({ from: gid(0, 2), to: gid(3, 0), oneway: true });
  for (let y = 0; y < 2; y++) for (let x = 0; x < 2; x++) cells.push({ id: `U-${x}-${y}`, surface: 'carpet', x: x + 0.5, y: y + 0.5, level: 1, start: false });
  links.push({ from: 'U-0-0', to: 'U-1-0', oneway: false }, { from: 'U-0-0', to: 'U-0-1', oneway: false }, { from: 'U-1-0', to: 'U-1-1', oneway: false }, { from: 'U-0-1', to: 'U-1-1', oneway: false });
  links.push({ from: gid(3, 2), to: 'U-1-1', oneway: false });
  const floor: FloorGraph = { format: 'underfoot-floor/1', name: hostile ? HOSTILE.building : 'Fixture Hall (invented)', surfaces, cells, links };
  const model = buildModel(floor, { hit: 0.8, dwell: 0.5 });
  // Cell G-1-1 (carpet? (1+1)%3 = 2 → third surface) reads oak most often: a worn patch.
  const m = surfaces.length;
  const worn = 5;
  model.emission.set([0.6, 0.1, 0.3], worn * m);

  const loop = (seed: number, history: number[], train: number, held: number | null): LoopRecord => ({
    seed, iterations: history.length, stopReason: 'converged', history, trainLogLikPerReading: train, heldOutLogLikPerReading: held, startDwell: 0.5,
  });
  const rng = new SeededRandom(21);
  const runIds = ['dock-1', 'dock-2', hostile ? HOSTILE.run : 'dock-3', 'dock-4', 'dock-5', 'dock-6'];
  const lines = ['run,step,reading'];
  for (const id of runIds) {
    const { obs } = sampleRun(model, 120, rng, 0.04);
    const field = /[",\n]/.test(id) ? `"${id.replace(/"/g, '""')}"` : id;
    obs.forEach((o, t) => lines.push(`${field},${t},${o < 0 ? '' : JSON.stringify(surfaces[o]).slice(1, -1)}`));
  }
  const fit: FitRecord = {
    tool: 'underfoot', toolVersion: '0.1.0', floorDigest: 'sha256:invented', runsDigests: [],
    options: { restarts: 3, holdout: 0.34, holdoutCol: null, seed: 1, transitions: 'tied', dwell: 0.5, hit: 0.8, priorStrength: 10, maxIter: 50, tol: 1e-6, finalPass: true, blockSize: 8, fromDigest: null },
    split: { fit: runIds.slice(0, 4), heldOut: runIds.slice(4) },
    nReadings: { fit: 460, heldOut: 230 },
    restarts: [
      loop(11, [-1.3, -1.1, -1.05, -1.04], -1.031, -1.052),
      loop(12, [-1.4, -1.2, -1.08, -1.02, -1.015], -1.012, -1.041),
      loop(13, [-1.25, -1.09, -1.06], -1.058, -1.07),
    ],
    selected: 1,
    selectedBy: 'held-out',
    finalPass: loop(12, [-1.03, -1.028], -1.027, null),
  };
  const runs = runsFromCsv(`${lines.join('\n')}\n`, 'runs.csv', { surfaces });
  const split = (r: string) => (fit.split.heldOut.includes(r) ? 'held-out' : 'fit');
  const decoded = decodeRuns(model, [runs], { lowConfidence: 0.5, surprisingBits: 2 }, split);
  const annotated = runsFromCsv(tableToCsv(decoded.annotated), 'annotated.csv', { surfaces });
  const runRows: RunRow[] = decoded.summaries.map((s) => ({
    run: s.run, split: s.split, steps: s.steps, dropouts: s.dropouts, loglikPerReading: s.loglikPerReading, meanPathP: s.meanPathP, lowConfidenceSteps: s.lowConfidenceSteps, surprisingSteps: s.surprisingSteps,
  }));
  return {
    floor,
    modelFile: { name: floor.name, model, fit },
    annotated,
    runRows,
    changes: [
      { cell: cells[worn].id, verdict: 'changed', surfaceBefore: surfaces[2], surfaceAfter: 'oak', expectedReadings: 210, tvDistance: 0.52, qValue: 1e-6, region: 'R1', candidates: [cells[worn].id], explanation: `Reads oak 70 % of the time, was ${surfaces[2]} 80 %: flagged, and the runs place the change on this cell.` },
      { cell: hostile ? HOSTILE.cell : 'G-0-0', verdict: 'unchanged', surfaceBefore: 'oak', surfaceAfter: 'oak', expectedReadings: 150, tvDistance: 0.03, qValue: 0.8, region: 'R2', candidates: [hostile ? HOSTILE.cell : 'G-0-0'], explanation: null },
      { cell: 'U-1-1', verdict: 'too-few-readings', surfaceBefore: 'carpet', surfaceAfter: 'carpet', expectedReadings: 4, tvDistance: 0.2, qValue: NaN, region: 'R3', candidates: ['U-1-1'], explanation: null },
    ],
    sources: { model: 'model.json', floor: 'floor.json', annotated: 'annotated.csv', summary: 'runs.csv', changes: hostile ? '<changes>.csv' : 'changes.csv' },
    ambiguity: { runs: 30, steps: 100, seed: 5 },
  };
}
