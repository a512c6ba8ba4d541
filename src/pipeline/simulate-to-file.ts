import { sampleOdometry } from '../model/sample-odometry.js';
import { readFloor } from '../io/read-floor.js';
import { readModel } from '../io/read-model.js';
import { writeTable } from '../io/write-table.js';
import { planOutputs } from '../io/plan-outputs.js';
import { outputTableFormatOf } from '../io/table-compression.js';
import { buildModel } from '../model/build-model.js';
import { checkModelFloor } from '../model/check-model-floor.js';
import { sampleRun } from '../model/sample-run.js';
import { SeededRandom } from '../model/seeded-random.js';
import type { HmmModel } from '../model/hmm-model.js';
import type { OutputTable } from '../io/output-table.js';

export interface SimulateConfig {
  floor: string;
  model: string | null;
  runs: number;
  steps: number;
  seed: number;
  out: string;
  hit: number;
  dwell: number;
  /** Probability that a reading is empty (sensor dropout). */
  dropoutRate: number;
  /** Probability that a step is lost entirely (its row is missing: a gap in `step`). */
  gapRate: number;
  /** Write odometry columns even when the model has no movement parameters. @default false */
  odometry?: boolean;
  /** Names of the odometry columns. @default 'moved', 'heading' */
  movedCol?: string;
  headingCol?: string;
}

export interface SimulateOutcome {
  nRuns: number;
  nRows: number;
  nDropouts: number;
  nGaps: number;
  source: 'model' | 'floor';
}

/**
 * `simulate`: draws runs from a model file (or from the floor's nominal surfaces with `hit` and `dwell`)
 * and writes a runs table with `run`, `step`, `reading` and the `true_cell` column. Seeded: the same
 * inputs and seed give the same table.
 */
export async function simulateToFile(config: SimulateConfig): Promise<SimulateOutcome> {
  outputTableFormatOf(config.out);
  await planOutputs('simulate', [{ path: config.floor, what: '--floor' }, { path: config.model, what: '--model' }], [{ path: config.out, what: '--out' }]);
  const floor = await readFloor(config.floor);
  let model: HmmModel;
  if (config.model) {
    const file = await readModel(config.model);
    checkModelFloor(file.model, config.model, floor, config.floor);
    model = file.model;
  } else {
    model = buildModel(floor, { hit: config.hit, dwell: config.dwell });
  }
  const rng = new SeededRandom(config.seed);
  const width = String(config.runs).length;
  const runCol: string[] = [];
  const stepCol: number[] = [];
  const readingCol: Array<string | null> = [];
  const cellCol: string[] = [];
  // Odometry (when asked for, or when the model has movement parameters) from its own generator, so
  // that the walk and readings are those of the same seed without odometry.
  const withOdometry = config.odometry === true || model.movement !== undefined;
  const odometryRng = new SeededRandom((config.seed ^ 0x6f646f6d) >>> 0);
  const movedCol: Array<number | null> = [];
  const headingCol: Array<number | null> = [];
  let nDropouts = 0;
  let nGaps = 0;
  for (let r = 0; r < config.runs; r++) {
    const id = `sim-${String(r + 1).padStart(Math.max(3, width), '0')}`;
    const { cells, obs } = sampleRun(model, config.steps, rng, config.dropoutRate);
    const odometry = withOdometry ? sampleOdometry(model, cells, odometryRng) : null;
    let carried = 0;
    for (let t = 0; t < config.steps; t++) {
      if (odometry) carried += odometry.moved[t];
      if (t > 0 && config.gapRate > 0 && rng.next() < config.gapRate) {
        nGaps++;
        continue;
      }
      if (odometry) {
        // The row after lost steps carries the distance since the previous row, and the last heading.
        movedCol.push(Math.round(carried * 1000) / 1000);
        headingCol.push(Number.isNaN(odometry.heading[t]) ? null : Math.round(odometry.heading[t] * 10) / 10 % 360);
        carried = 0;
      }
      runCol.push(id);
      stepCol.push(t);
      readingCol.push(obs[t] < 0 ? null : model.surfaces[obs[t]]);
      if (obs[t] < 0) nDropouts++;
      cellCol.push(model.cells[cells[t]].id);
    }
  }
  const table: OutputTable = {
    nRows: runCol.length,
    columns: [
      { name: 'run', kind: 'utf8', get: (i) => runCol[i] },
      { name: 'step', kind: 'int32', get: (i) => stepCol[i] },
      { name: 'reading', kind: 'utf8', get: (i) => readingCol[i] },
      ...(withOdometry
        ? ([
            { name: config.movedCol ?? 'moved', kind: 'float64', get: (i: number) => movedCol[i] },
            { name: config.headingCol ?? 'heading', kind: 'float64', get: (i: number) => headingCol[i] },
          ] as OutputTable['columns'])
        : []),
      { name: 'true_cell', kind: 'utf8', get: (i) => cellCol[i] },
    ],
  };
  await writeTable(config.out, table);
  return { nRuns: config.runs, nRows: table.nRows, nDropouts, nGaps, source: config.model ? 'model' : 'floor' };
}
