import { InputError, quote } from '../errors.js';
import type { RunsTable } from './runs-table.js';

/** Odometry of one run per step (index t = step `firstStep + t`, the movement from step t−1 to t); NaN = unknown. */
export interface RunOdometry {
  moved: Float64Array;
  heading: Float64Array;
}

export interface MovementColumnOptions {
  /** Distance column. @default 'moved' */
  movedCol?: string;
  /** Heading column. @default 'heading' */
  headingCol?: string;
}

export interface TableMovement {
  /** The columns found (null when absent). */
  movedCol: string | null;
  headingCol: string | null;
  /** Per run of the table, in its order; null when the table has neither column. */
  runs: RunOdometry[] | null;
}

/**
 * The wheel-odometry columns of a runs table (DEVELOPERS.md, "Movement"): `moved` — metres travelled
 * since the previous row of the run, a number ≥ 0 — and `heading` — degrees in the floor's frame
 * (0 = +x, counter-clockwise), in [0, 360); empty or null = unknown. A column renamed by an option must
 * exist; a default-named one may be absent (then that quantity is unknown everywhere).
 *
 * Gaps (steps missing from the table): a row after k missing steps carries the movement since the
 * previous row, i.e. over k + 1 transitions; each of them gets an equal share of the distance, moved/(k+1),
 * and the same heading. The first row of a run has no previous row: its values are not used.
 *
 * Bad values are errors naming the run and the step: a distance that is not a number or negative, a
 * heading that is not a number or outside [0, 360).
 */
export function runMovement(table: RunsTable, options: MovementColumnOptions = {}): TableMovement {
  const find = (name: string | undefined, fallback: string, option: string): RunsTable['columns'][number] | null => {
    const wanted = name ?? fallback;
    const column = table.columns.find((c) => c.name === wanted) ?? null;
    if (!column && name !== undefined) {
      throw new InputError(
        `${table.source}: the ${option} column must exist, got no column ${quote(wanted)} (columns: ${table.columns.map((c) => c.name).join(', ')})`,
      );
    }
    return column;
  };
  const moved = find(options.movedCol, 'moved', '--moved-col');
  const heading = find(options.headingCol, 'heading', '--heading-col');
  if (!moved && !heading) return { movedCol: null, headingCol: null, runs: null };
  const runs = table.runs.map((run) => {
    const T = run.obs.length;
    const out: RunOdometry = { moved: new Float64Array(T).fill(NaN), heading: new Float64Array(T).fill(NaN) };
    let lastPresent = -1;
    for (let t = 0; t < T; t++) {
      const row = run.rows[t];
      if (row < 0) continue;
      const step = run.firstStep + t;
      const d = moved ? numberAt(moved.get(row), table.source, run.id, step, moved.name, (x) => x >= 0, 'a number >= 0 (metres since the previous row)') : NaN;
      const h = heading ? numberAt(heading.get(row), table.source, run.id, step, heading.name, (x) => x >= 0 && x < 360, 'a number in [0, 360) (degrees)') : NaN;
      if (lastPresent >= 0) {
        const share = t - lastPresent;
        for (let u = lastPresent + 1; u <= t; u++) {
          out.moved[u] = d / share;
          out.heading[u] = h;
        }
      }
      lastPresent = t;
    }
    return out;
  });
  return { movedCol: moved?.name ?? null, headingCol: heading?.name ?? null, runs };
}

function numberAt(
  raw: string | number | bigint | boolean | null,
  source: string,
  run: string,
  step: number,
  column: string,
  ok: (x: number) => boolean,
  requirement: string,
): number {
  if (raw === null || raw === '') return NaN;
  const x = typeof raw === 'number' ? raw : typeof raw === 'bigint' ? Number(raw) : typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : NaN;
  if (!Number.isFinite(x) || !ok(x)) {
    throw new InputError(`${source}: ${column} at run ${quote(run)} step ${step} must be ${requirement}, got ${quote(raw)}`);
  }
  return x;
}
