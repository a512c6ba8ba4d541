import type { FloorCell, FloorGraph, FloorLink } from '../src/model/floor-graph.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { RunReadings } from '../src/fit/em-iteration.js';
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';

export type ScenarioSize = 'small' | 'medium' | 'large' | 'xlarge';

export interface Scenario {
  /** e.g. `grid-small-seed1`. */
  name: string;
  floor: FloorGraph;
  /** The model the runs were drawn from. */
  truth: HmmModel;
  runs: RunReadings[];
  /** The true cell index at every step of every run (same order as `runs`), for checks. */
  truePaths: Int32Array[];
}

interface SizeSpec {
  /** Grid columns and rows: every grid position is a cell. */
  width: number;
  height: number;
  nRuns: number;
  nSteps: number;
}

/** Grid sizes and run counts of each benchmark scenario. */
export const SCENARIO_SIZES: Readonly<Record<ScenarioSize, SizeSpec>> = {
  small: { width: 10, height: 10, nRuns: 50, nSteps: 500 },
  medium: { width: 20, height: 20, nRuns: 200, nSteps: 2000 },
  large: { width: 40, height: 40, nRuns: 200, nSteps: 2000 },
  /** A campus: 10 000 cells; not in `npm run bench` by default (see `bench/xlarge-fit.ts`). */
  xlarge: { width: 100, height: 100, nRuns: 1000, nSteps: 5000 },
};

const SURFACES = ['oak', 'laminate', 'carpet', 'tile', 'rubber', 'concrete'];
/** Truth model: dwell and hit before the emission perturbation. */
const TRUTH_DWELL = 0.6;
const TRUTH_HIT = 0.8;
/** Dirichlet concentration of the emission perturbation: row i ~ Dirichlet(CONCENTRATION · prior row i). */
const CONCENTRATION = 40;
/** Share of readings replaced by dropouts in the sampled runs. */
const DROPOUT_RATE = 0.02;
/** Corridor rows are the rows y with y % BAND === 0; rooms fill the rows between. */
const BAND = 5;
const N_DOCKS = 4;

/**
 * A seeded benchmark scenario: an invented grid building of rooms and corridors (not the demo
 * building), a truth model and runs sampled from it.
 *
 * Building: a `width × height` grid of 1 m cells, every position a cell. Column 0 and every fifth row
 * are corridors, joined to their corridor neighbours. Between corridor rows, bands of rooms 3–5 cells
 * wide (seeded; up to 7 at the east wall); a room's cells are joined to their four neighbours inside the
 * room, and the room has a door to the corridor below it, sometimes a second one to the corridor above
 * (sometimes one-way, out of the room) and sometimes a door to the room to its west. Each room and each
 * corridor row has one seeded surface out of six. Four corridor cells are docks (start cells). Every
 * cell can reach and be reached from the docks.
 *
 * Truth: `buildModel(floor, { dwell: 0.6, hit: 0.8 })`, then every emission row redrawn from a
 * Dirichlet with concentrations 40 × the survey-prior row (same mean, about ±0.06 on the hit entry).
 * Runs: `sampleRun` with 2 % dropouts. Same size and seed → identical scenario.
 */
export function makeScenario(size: ScenarioSize, seed: number): Scenario {
  const spec = SCENARIO_SIZES[size];
  if (!spec) throw new RangeError(`makeScenario: size must be small, medium, large or xlarge, got ${String(size)}`);
  const rng = new SeededRandom(seed);
  const floor = makeGridFloor(spec.width, spec.height, rng, `grid-${size}-seed${seed}`);
  const truth = buildModel(floor, { dwell: TRUTH_DWELL, hit: TRUTH_HIT });
  perturbEmissions(truth, rng);
  const runs: RunReadings[] = [];
  const truePaths: Int32Array[] = [];
  const width = String(spec.nRuns).length;
  for (let k = 0; k < spec.nRuns; k++) {
    const run = sampleRun(truth, spec.nSteps, rng, DROPOUT_RATE);
    runs.push({ id: `run-${String(k + 1).padStart(width, '0')}`, obs: run.obs });
    truePaths.push(run.cells);
  }
  return { name: floor.name, floor, truth, runs, truePaths };
}

function makeGridFloor(width: number, height: number, rng: SeededRandom, name: string): FloorGraph {
  const id = (x: number, y: number): string => `g${String(x).padStart(2, '0')}-${String(y).padStart(2, '0')}`;
  const isCorridor = (x: number, y: number): boolean => x === 0 || y % BAND === 0;
  const surface = new Array<string>(width * height);
  const links: FloorLink[] = [];
  const link = (x1: number, y1: number, x2: number, y2: number, oneway = false): void => {
    links.push({ from: id(x1, y1), to: id(x2, y2), oneway });
  };

  // Corridors: the spine (column 0) has one surface, each corridor row its own.
  const spine = SURFACES[rng.int(SURFACES.length)];
  for (let y = 0; y < height; y++) {
    const rowSurface = y % BAND === 0 ? SURFACES[rng.int(SURFACES.length)] : spine;
    for (let x = 0; x < width; x++) {
      if (!isCorridor(x, y)) continue;
      surface[y * width + x] = x === 0 ? spine : rowSurface;
      if (x > 0 && y % BAND === 0) link(x - 1, y, x, y);
      if (x === 0 && y > 0) link(0, y - 1, 0, y);
    }
  }

  // Rooms, band by band.
  for (let y0 = 1; y0 < height; y0 += BAND) {
    const y1 = Math.min(y0 + BAND - 2, height - 1); // last room row of the band
    const hasCorridorAbove = y1 + 1 < height && (y1 + 1) % BAND === 0;
    let x0 = 1;
    let westRoom: { x0: number; x1: number } | null = null;
    while (x0 < width) {
      let x1 = x0 + 2 + rng.int(3); // 3–5 cells wide
      if (width - 1 - x1 < 3) x1 = width - 1; // no room narrower than 3 at the east wall
      const roomSurface = SURFACES[rng.int(SURFACES.length)];
      for (let y = y0; y <= y1; y++) {
        for (let x = x0; x <= x1; x++) {
          surface[y * width + x] = roomSurface;
          if (x > x0) link(x - 1, y, x, y);
          if (y > y0) link(x, y - 1, x, y);
        }
      }
      const xDoor = x0 + rng.int(x1 - x0 + 1);
      link(xDoor, y0, xDoor, y0 - 1);
      if (hasCorridorAbove && rng.next() < 0.5) {
        const x = x0 + rng.int(x1 - x0 + 1);
        link(x, y1, x, y1 + 1, rng.next() < 0.3);
      }
      if (westRoom && rng.next() < 0.3) {
        const y = y0 + rng.int(y1 - y0 + 1);
        link(westRoom.x1, y, x0, y);
      }
      westRoom = { x0, x1 };
      x0 = x1 + 1;
    }
  }

  // Docks: distinct corridor cells.
  const corridorCells: number[] = [];
  for (let i = 0; i < width * height; i++) if (isCorridor(i % width, Math.floor(i / width))) corridorCells.push(i);
  const docks = new Set<number>();
  while (docks.size < N_DOCKS) docks.add(corridorCells[rng.int(corridorCells.length)]);

  const cells: FloorCell[] = [];
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      cells.push({ id: id(x, y), surface: surface[i], x: x + 0.5, y: y + 0.5, level: 0, start: docks.has(i) });
    }
  }
  return { format: 'underfoot-floor/1', name, surfaces: SURFACES.slice(), cells, links };
}

/** Redraws every emission row from Dirichlet(CONCENTRATION · row) by normalised gamma variates. */
function perturbEmissions(model: HmmModel, rng: SeededRandom): void {
  const m = model.surfaces.length;
  const n = model.cells.length;
  const e = model.emission;
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += e[i * m + r] = rng.gamma(CONCENTRATION * e[i * m + r]);
    for (let r = 0; r < m; r++) e[i * m + r] /= sum;
  }
}
