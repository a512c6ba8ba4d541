import { readFloor } from '../io/read-floor.js';
import { analyzeFloor, type FloorAnalysis } from '../model/analyze-floor.js';
import type { Georeference } from '../model/floor-graph.js';
import type { KeyColumns } from './key-columns.js';
import { loadRuns } from './load-runs.js';

export interface RunsCheck {
  files: string[];
  runs: number;
  /** Steps including gap-filled ones. */
  steps: number;
  rows: number;
  dropouts: number;
  gapSteps: number;
  unknownReadings: number;
  shortestRun: number;
  longestRun: number;
  /** Readings per surface, in the floor's surface order. */
  readingCounts: Record<string, number>;
  /**
   * Wheel odometry, when the tables have it: the columns found and the transitions (steps after the
   * first of a run) whose distance / heading is known.
   */
  odometry?: { movedCol: string | null; headingCol: string | null; knownDistance: number; knownHeading: number; transitions: number };
}

export interface CheckReport {
  floorFile: string;
  name: string;
  floor: FloorAnalysis;
  nStartCells: number;
  /** The floor's georeference, null when it has none. */
  georeference: Georeference | null;
  runs: RunsCheck | null;
  warnings: string[];
}

/** `check`: validates the floor (and runs, if given) and gathers the figures a person needs at a glance. */
export async function checkInputs(floorPath: string, runPaths: string[], keys: KeyColumns): Promise<CheckReport> {
  const floor = await readFloor(floorPath);
  const analysis = analyzeFloor(floor);
  const warnings = [...analysis.warnings];
  let runs: RunsCheck | null = null;
  if (runPaths.length) {
    // Only the rows present are laid out: the figures below need no memory per missing step.
    const loaded = await loadRuns(runPaths, { surfaces: floor.surfaces, ...keys, fillGaps: false });
    warnings.push(...loaded.warnings);
    const readingCounts: Record<string, number> = Object.fromEntries(floor.surfaces.map((s) => [s, 0]));
    const counts = new Float64Array(floor.surfaces.length);
    let steps = 0;
    let dropouts = 0;
    let gapSteps = 0;
    let unknown = 0;
    let rows = 0;
    let shortest = Infinity;
    let longest = 0;
    for (const table of loaded.tables) {
      rows += table.nRows;
      for (const run of table.runs) {
        steps += run.nSteps;
        dropouts += run.nDropouts;
        gapSteps += run.nGapSteps;
        unknown += run.nUnknown;
        shortest = Math.min(shortest, run.nSteps);
        longest = Math.max(longest, run.nSteps);
        for (let t = 0; t < run.obs.length; t++) if (run.obs[t] >= 0) counts[run.obs[t]]++;
      }
    }
    floor.surfaces.forEach((s, r) => (readingCounts[s] = counts[r]));
    runs = {
      files: runPaths,
      runs: loaded.runs.length,
      steps,
      rows,
      dropouts,
      gapSteps,
      unknownReadings: unknown,
      shortestRun: shortest === Infinity ? 0 : shortest,
      longestRun: longest,
      readingCounts,
    };
    if (loaded.movement) {
      let knownDistance = 0;
      let knownHeading = 0;
      let transitions = 0;
      for (const run of loaded.runs) {
        if (!run.moves) continue;
        for (let t = 1; t < run.moves.dBin.length; t++) {
          transitions++;
          if (run.moves.dBin[t] >= 0) knownDistance++;
          if (run.moves.hBin[t] >= 0) knownHeading++;
        }
      }
      runs.odometry = { ...loaded.movement, knownDistance, knownHeading, transitions };
    }
    const tiny = loaded.tables.reduce((k, table) => k + table.runs.filter((r) => r.nSteps < 2).length, 0);
    if (tiny) warnings.push(`${tiny} run(s) have a single step: they say little about movement`);
    if (gapSteps) warnings.push(`${gapSteps} step(s) are missing from the runs (gaps in "${keys.timeCol ?? keys.stepCol}"); they are decoded as dropouts`);
  }
  return { floorFile: floorPath, name: floor.name, floor: analysis, nStartCells: floor.cells.filter((c) => c.start).length, georeference: floor.georeference ?? null, runs, warnings };
}
