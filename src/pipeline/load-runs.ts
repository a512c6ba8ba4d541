import { runMovement, type MovementColumnOptions } from '../io/run-movement.js';
import { moveStepsFromOdometry } from '../model/move-steps-from-odometry.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import { InputError, quote } from '../errors.js';
import { readRuns } from '../io/read-runs.js';
import { fileDigest } from '../io/file-digest.js';
import type { ReadRunsOptions, RunsTable } from '../io/runs-table.js';

export interface LoadedRuns {
  tables: RunsTable[];
  digests: Array<{ file: string; sha256: string }>;
  /** Every run of every table, in file order then run order, with where it came from. */
  runs: Array<{ id: string; obs: Int32Array; table: number; run: number; moves?: MoveSteps }>;
  /** The odometry columns found in any table (DEVELOPERS.md, "Movement"); null when no table has them. */
  movement: { movedCol: string | null; headingCol: string | null } | null;
  warnings: string[];
}

/**
 * Reads one or more runs tables; run ids must be unique across them, and their steps together must stay
 * within `maxTotalSteps` of their rows (each table is told what the tables before it hold).
 */
export async function loadRuns(paths: string[], options: ReadRunsOptions & MovementColumnOptions): Promise<LoadedRuns> {
  if (paths.length === 0) throw new InputError('runs: at least one runs table must be given, got none');
  const tables: RunsTable[] = [];
  const digests: LoadedRuns['digests'] = [];
  const runs: LoadedRuns['runs'] = [];
  const seen = new Map<string, string>();
  const warnings: string[] = [];
  const prior = { rows: 0, steps: 0 };
  let movement = null as LoadedRuns['movement'];
  for (const path of paths) {
    const table = await readRuns(path, { ...options, prior: { ...prior } });
    prior.rows += table.nRows;
    for (const run of table.runs) prior.steps += run.nSteps;
    const t = tables.length;
    tables.push(table);
    digests.push({ file: path, sha256: await fileDigest(path) });
    const odometry = runMovement(table, { movedCol: options.movedCol, headingCol: options.headingCol });
    if (odometry.runs) movement = { movedCol: odometry.movedCol ?? movement?.movedCol ?? null, headingCol: odometry.headingCol ?? movement?.headingCol ?? null };
    table.runs.forEach((run, r) => {
      const other = seen.get(run.id);
      if (other !== undefined) throw new InputError(`${path}: run ids must be unique across runs tables, got ${quote(run.id)} also in ${other}`);
      seen.set(run.id, path);
      const od = odometry.runs?.[r];
      runs.push(od ? { id: run.id, obs: run.obs, table: t, run: r, moves: moveStepsFromOdometry(od.moved, od.heading) } : { id: run.id, obs: run.obs, table: t, run: r });
    });
    warnings.push(...table.warnings);
  }
  return { tables, digests, runs, warnings, movement };
}
