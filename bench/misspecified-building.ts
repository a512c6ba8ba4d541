import type { FloorCell, FloorGraph, FloorLink } from '../src/model/floor-graph.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { RunReadings } from '../src/fit/em-iteration.js';
import { buildModel } from '../src/model/build-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';

/** Size of an invented misspecified building and of its runs. */
export interface MisspecifiedSpec {
  /** Grid columns and rows of each of the two levels (1 m cells). */
  width: number;
  height: number;
  /** Room size in cells (rooms are room × room blocks of one surface). */
  room: number;
  /** Runs to fit on (the fit holds its own share out) and fresh runs to evaluate on. */
  nRuns: number;
  nTestRuns: number;
  nSteps: number;
  /** Range of the true per-cell dwell probabilities. */
  dwellRange: [number, number];
  /** Gamma shape of the true link weights (1: very unequal; larger: closer to equal). */
  linkShape: number;
}

export interface MisspecifiedBuilding {
  name: string;
  floor: FloorGraph;
  /** The model the runs were drawn from: per-cell dwells, unequal link weights. */
  truth: HmmModel;
  runs: RunReadings[];
  truePaths: Int32Array[];
  /** Fresh runs from the same truth, never fitted on. */
  testRuns: RunReadings[];
  testPaths: Int32Array[];
}

const SURFACES = ['oak', 'carpet', 'tile', 'rubber', 'vinyl'];
const HIT = 0.8;
/** Dirichlet concentration of the emission rows around the survey prior (look-alike confusion). */
const CONCENTRATION = 40;
const DROPOUT_RATE = 0.02;

/** The two invented buildings of the calibration figures (DEVELOPERS.md) and tests. */
export const MISSPECIFIED_SPECS: Readonly<Record<'small' | 'wide' | 'test', MisspecifiedSpec>> = {
  test: { width: 4, height: 3, room: 1, nRuns: 110, nTestRuns: 40, nSteps: 500, dwellRange: [0.35, 0.85], linkShape: 2 },
  small: { width: 5, height: 4, room: 2, nRuns: 80, nTestRuns: 40, nSteps: 400, dwellRange: [0.35, 0.85], linkShape: 2 },
  wide: { width: 8, height: 5, room: 3, nRuns: 80, nTestRuns: 40, nSteps: 400, dwellRange: [0.2, 0.9], linkShape: 1 },
};

/**
 * An invented two-level building whose true movement is NOT the tool's movement model: each cell has
 * its own dwell (uniform in `dwellRange`) and its links unequal weights (Gamma(`linkShape`) draws, normalised),
 * so `fixed`/`tied` fits are misspecified, with the truth known. Each level is a `width × height` grid
 * of 1 m cells, 4-neighbour links, split into `room × room` blocks of one surface (seeded, repeats
 * allowed: look-alike rooms); a lift joins the two levels' corner cells; two one-way links per level.
 * Emission rows: Dirichlet(40 · survey prior row, hit 0.8). Runs: `sampleRun` with 2 % dropouts.
 */
export function misspecifiedBuilding(spec: MisspecifiedSpec, seed: number): MisspecifiedBuilding {
  const rng = new SeededRandom(seed);
  const { width: w, height: h, room } = spec;
  const id = (x: number, y: number, l: number): string => `L${l}-${x}-${y}`;
  const cells: FloorCell[] = [];
  const links: FloorLink[] = [];
  for (let l = 0; l < 2; l++) {
    const roomSurface = new Map<string, string>();
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        const key = `${Math.floor(x / room)},${Math.floor(y / room)}`;
        if (!roomSurface.has(key)) roomSurface.set(key, SURFACES[rng.int(SURFACES.length)]);
        cells.push({ id: id(x, y, l), surface: roomSurface.get(key)!, x: x + 0.5, y: y + 0.5, level: l, start: false });
        if (x + 1 < w) links.push({ from: id(x, y, l), to: id(x + 1, y, l), oneway: false });
        if (y + 1 < h) links.push({ from: id(x, y, l), to: id(x, y + 1, l), oneway: false });
      }
    }
    // Two one-way shortcuts (diagonals, so they duplicate no grid link).
    for (let k = 0; k < 2; k++) {
      const x = rng.int(w - 1);
      const y = rng.int(h - 1);
      links.push({ from: id(x, y, l), to: id(x + 1, y + 1, l), oneway: true });
    }
  }
  links.push({ from: id(0, 0, 0), to: id(0, 0, 1), oneway: false });
  const floor: FloorGraph = { format: 'underfoot-floor/1', name: `misspecified-${w}x${h}-seed${seed}`, surfaces: SURFACES.slice(), cells, links };
  // A diagonal shortcut may repeat: keep the first of each (from, to).
  const seen = new Set<string>();
  floor.links = links.filter((k) => {
    const key = `${k.from}>${k.to}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });

  const truth = buildModel(floor, { dwell: 0.5, hit: HIT });
  const s = truth.structure;
  const [lo, hi] = spec.dwellRange;
  for (let i = 0; i < s.nCells; i++) {
    const nLinks = s.succPtr[i + 1] - s.succPtr[i] - 1;
    if (nLinks === 0) continue;
    const d = lo + (hi - lo) * rng.next();
    let sum = 0;
    const weights: number[] = [];
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      const g = k === s.dwellPos[i] ? 0 : 0.05 + rng.gamma(spec.linkShape);
      weights.push(g);
      sum += g;
    }
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      truth.trans[k] = k === s.dwellPos[i] ? d : ((1 - d) * weights[k - s.succPtr[i]]) / sum;
    }
  }
  const m = SURFACES.length;
  for (let i = 0; i < s.nCells; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(CONCENTRATION * truth.emission[i * m + r]);
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
  const draw = (n: number, prefix: string) => {
    const runs: RunReadings[] = [];
    const paths: Int32Array[] = [];
    for (let k = 0; k < n; k++) {
      const run = sampleRun(truth, spec.nSteps, rng, DROPOUT_RATE);
      runs.push({ id: `${prefix}-${String(k + 1).padStart(3, '0')}`, obs: run.obs });
      paths.push(run.cells);
    }
    return { runs, paths };
  };
  const fitting = draw(spec.nRuns, 'run');
  const testing = draw(spec.nTestRuns, 'test');
  return { name: floor.name, floor, truth, runs: fitting.runs, truePaths: fitting.paths, testRuns: testing.runs, testPaths: testing.paths };
}
