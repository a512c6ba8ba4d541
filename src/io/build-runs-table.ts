import { InputError, quote } from '../errors.js';
import { isWellFormedText } from './json-fields.js';
import { listForMessage } from './list-for-message.js';
import { formatPeriod, parseTime } from './parse-time.js';
import { DROPOUT, type InputColumn, type ReadRunsOptions, type RunSequence, type RunsTable } from './runs-table.js';

/** A table's rows as the runs builder needs them, whatever file format they came from. */
export interface KeyedRows {
  source: string;
  nRows: number;
  columns: InputColumn[];
  runCol: string;
  stepCol: string;
  readingCol: string;
  /** The time column when steps come from times (`options.timeCol`); `stepAt` then returns times. */
  timeCol?: string;
  /** Writes a time (seconds) as messages show it, for time columns that are not text (Arrow timestamps). */
  describeTime?: (seconds: number) => string;
  /**
   * Values of the run, step and reading columns at a row (`null`/`undefined` for a missing value): text,
   * numbers or bigints. Called once per row, in row order.
   */
  runAt(row: number): unknown;
  stepAt(row: number): unknown;
  readingAt(row: number): unknown;
  /** Names a row for messages: `line 14` for CSV, `row 13` for Arrow. */
  locate(row: number): string;
}

/** A run may have at most this many steps filled in for missing samples (a guard against timestamps). */
export const MAX_GAP_STEPS = 10_000_000;

/**
 * The steps of all runs together (first to last step of each run, gaps included) may number at most
 * `maxTotalSteps(rows)` = min(`MAX_TOTAL_STEPS`, `STEPS_PER_ROW` × rows + `STEPS_BASE`) over all runs
 * tables read together: memory then grows with the input's own size, whatever its step numbers say
 * (a few bytes of text can otherwise name steps 0 and 10⁷ and ask for 10⁷ steps of memory).
 */
export const MAX_TOTAL_STEPS = 100_000_000;
export const STEPS_PER_ROW = 1000;
export const STEPS_BASE = 1_000_000;

/** The most steps (gaps included) that runs tables of `rows` rows in all may fill in. */
export function maxTotalSteps(rows: number): number {
  return Math.min(MAX_TOTAL_STEPS, STEPS_PER_ROW * rows + STEPS_BASE);
}

const UNKNOWN = -2;

/** Parses a step value: a whole number >= 0 (number, bigint or decimal text such as `12` or `12.0`); -1 if not. */
function toStep(value: unknown): number {
  if (typeof value === 'number') return Number.isSafeInteger(value) && value >= 0 ? value : -1;
  if (typeof value === 'bigint') return value >= 0n && value <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(value) : -1;
  if (typeof value === 'string' && /^\+?\d+(\.0*)?$/.test(value)) {
    const step = Number(value);
    return Number.isSafeInteger(step) ? step : -1;
  }
  return -1;
}

function describeValue(value: unknown): string {
  if (value === null || value === undefined || value === '') return 'an empty value';
  if (typeof value === 'bigint') return `${value}`;
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  return quote(value);
}

/**
 * Turns rows into runs (docs/formats.md, "Runs table"): rows grouped by run (runs in order of first
 * appearance), each run's rows sorted by step (stable), readings coded by their index in
 * `options.surfaces`. Empty/null readings and steps missing between the first and last step are
 * DROPOUT. Errors (InputError, one line naming the file, run and step or line): an empty table, an empty
 * run id, a step that is not a whole number >= 0, a step repeated within a run, a reading not in the
 * surfaces (unless `unknownReadings: 'dropout'`, which counts them and adds one warning), more steps
 * in all than `maxTotalSteps` allows (checked before any run's steps are laid out; `options.prior`
 * carries the rows and steps of tables read before this one).
 * Memory is a few typed arrays over rows; no per-row objects. With `fillGaps: false` a run's `obs` and
 * `rows` hold only the steps present in the file, so memory stays per row whatever the gaps.
 */
export function buildRunsTable(input: KeyedRows, options: ReadRunsOptions): RunsTable {
  const { source, nRows, locate } = input;
  if (nRows === 0) throw new InputError(`${source}: table must have at least one row of readings, got none`);
  const unknownAsDropout = (options.unknownReadings ?? 'error') === 'dropout';
  const codeOf = new Map<string, number>(options.surfaces.map((surface, i) => [surface, i]));
  // Case-folded labels, only where folding keeps surfaces apart (never guess between "Tile" and "tile").
  const codeOfFolded = new Map<string, number>();
  const foldCounts = new Map<string, number>();
  for (const surface of options.surfaces) foldCounts.set(surface.toLowerCase(), (foldCounts.get(surface.toLowerCase()) ?? 0) + 1);
  options.surfaces.forEach((surface, i) => {
    if (foldCounts.get(surface.toLowerCase()) === 1) codeOfFolded.set(surface.toLowerCase(), i);
  });
  const repaired = new Map<string, number>();

  // Pass 1, in file order so the first bad row is the one reported.
  const runIndex = new Map<string, number>();
  const runIds: string[] = [];
  // A few bytes per row: steps as 32-bit integers until one needs more (then as float64, exact to 2^53),
  // reading codes in one byte when the surfaces allow (the codes, DROPOUT and UNKNOWN then fit).
  const runOfRow = new Int32Array(nRows);
  let stepOfRow: Int32Array | Float64Array = new Int32Array(nRows);
  const codeOfRow = options.surfaces.length <= 127 ? new Int8Array(nRows) : new Int32Array(nRows);
  const unknownLabels = new Map<string, number>();
  let lastRunId = '';
  let lastRun = -1;
  const timeCol = input.timeCol;
  const timeOfRow = timeCol !== undefined ? new Float64Array(nRows) : null;
  for (let row = 0; row < nRows; row++) {
    const rawRun = input.runAt(row);
    if (rawRun === null || rawRun === undefined || rawRun === '') {
      throw new InputError(`${source}: run at ${locate(row)} must be a run id, got an empty value`);
    }
    const runId = typeof rawRun === 'string' ? rawRun : String(rawRun);
    // Rows of one run usually follow each other: skip the map then.
    let r = runId === lastRunId ? lastRun : runIndex.get(runId);
    if (r === undefined) {
      if (!isWellFormedText(runId)) {
        throw new InputError(`${source}: run at ${locate(row)} must be a run id of well-formed Unicode text, got ${quote(runId)} with a lone surrogate`);
      }
      r = runIds.length;
      runIndex.set(runId, r);
      runIds.push(runId);
    }
    runOfRow[row] = r;
    lastRunId = runId;
    lastRun = r;

    const rawStep = input.stepAt(row);
    if (timeOfRow) {
      const time = parseTime(rawStep);
      if (Number.isNaN(time)) {
        throw new InputError(
          `${source}: time of run ${quote(runId)} at ${locate(row)} must be a time (seconds, or ISO 8601 text such as 2026-03-01T09:30:00.250Z), got ${describeValue(rawStep)}`,
        );
      }
      timeOfRow[row] = time;
    }
    const step = timeOfRow ? 0 : toStep(rawStep);
    if (step < 0) {
      throw new InputError(
        `${source}: step of run ${quote(runId)} at ${locate(row)} must be a whole number >= 0, got ${describeValue(rawStep)}`,
      );
    }
    if (step > 0x7fffffff && stepOfRow instanceof Int32Array) stepOfRow = Float64Array.from(stepOfRow);
    stepOfRow[row] = step;

    const rawReading = input.readingAt(row);
    if (rawReading === null || rawReading === undefined || rawReading === '') {
      codeOfRow[row] = DROPOUT;
      continue;
    }
    const label = typeof rawReading === 'string' ? rawReading : String(rawReading);
    let code = codeOf.get(label);
    if (code === undefined) {
      // Documented repair: surrounding spaces and letter case are not part of a label ("Oak " = "oak");
      // a label of spaces only is a dropout. Every repair is counted and reported as a warning.
      const trimmed = label.trim();
      if (trimmed === '') {
        codeOfRow[row] = DROPOUT;
        repaired.set(`${quote(label)} → no reading`, (repaired.get(`${quote(label)} → no reading`) ?? 0) + 1);
        continue;
      }
      code = codeOf.get(trimmed) ?? codeOfFolded.get(trimmed.toLowerCase());
      if (code !== undefined) repaired.set(`${quote(label)} → ${quote(options.surfaces[code])}`, (repaired.get(`${quote(label)} → ${quote(options.surfaces[code])}`) ?? 0) + 1);
    }
    if (code !== undefined) {
      codeOfRow[row] = code;
    } else if (!isWellFormedText(label)) {
      const stepForMessage = timeOfRow ? `time ${describeValue(rawStep)}` : `step ${step}`;
      throw new InputError(`${source}: reading at run ${quote(runId)} ${stepForMessage} must be well-formed Unicode text, got ${quote(label)} with a lone surrogate`);
    } else if (unknownAsDropout) {
      codeOfRow[row] = UNKNOWN;
      unknownLabels.set(label, (unknownLabels.get(label) ?? 0) + 1);
    } else {
      // Made only here: a message string per row would cost more than the rest of the row's work.
      const stepForMessage = timeOfRow ? `time ${describeValue(rawStep)}` : `step ${step}`;
      throw new InputError(
        `${source}: reading at run ${quote(runId)} ${stepForMessage} must be one of the floor's surfaces ` +
          `(${listForMessage(options.surfaces, 8)}), got ${quote(label)}`,
      );
    }
  }

  // Pass 2: rows grouped by run with a counting sort (keeps file order within a run).
  const nRuns = runIds.length;
  const start = new Int32Array(nRuns + 1);
  for (let row = 0; row < nRows; row++) start[runOfRow[row] + 1]++;
  for (let r = 0; r < nRuns; r++) start[r + 1] += start[r];
  const fill = start.slice(0, nRuns);
  const order = new Int32Array(nRows);
  for (let row = 0; row < nRows; row++) order[fill[runOfRow[row]]++] = row;

  // Times to steps: each run's rows sorted by time, step = round((t − t_first) / period).
  const warnings: string[] = [];
  let period: number | null = null;
  if (timeOfRow && timeCol !== undefined) {
    const mapped = timesToSteps(input, timeCol, timeOfRow, order, start, runIds, options.period);
    stepOfRow = mapped.steps;
    period = mapped.period;
    if (mapped.inferred) {
      warnings.push(
        `${source}: period ${formatPeriod(period)} inferred from the spacing of the times in column ${quote(timeCol)} (set it with --period)`,
      );
    }
  }

  // Pass 3: per run, sort by step and reject repeats; the steps each run spans, checked against the
  // limits before any run's steps are laid out.
  const nStepsOfRun = new Float64Array(nRuns);
  const priorRows = options.prior?.rows ?? 0;
  let totalSteps = options.prior?.steps ?? 0;
  const limit = maxTotalSteps(priorRows + nRows);
  for (let r = 0; r < nRuns; r++) {
    const rowsOfRun = order.subarray(start[r], start[r + 1]);
    let sorted = true;
    for (let k = 1; k < rowsOfRun.length && sorted; k++) sorted = stepOfRow[rowsOfRun[k]] >= stepOfRow[rowsOfRun[k - 1]];
    if (!sorted) rowsOfRun.sort((a, b) => stepOfRow[a] - stepOfRow[b] || a - b);
    for (let k = 1; k < rowsOfRun.length; k++) {
      const a = rowsOfRun[k - 1];
      const b = rowsOfRun[k];
      if (stepOfRow[a] === stepOfRow[b]) {
        throw new InputError(
          `${source}: step ${stepOfRow[a]} of run ${quote(runIds[r])} must appear once, got it twice (${locate(a)} and ${locate(b)})`,
        );
      }
    }
    const firstStep = stepOfRow[rowsOfRun[0]];
    const lastStep = stepOfRow[rowsOfRun[rowsOfRun.length - 1]];
    const nSteps = lastStep - firstStep + 1;
    const nGapSteps = nSteps - rowsOfRun.length;
    if (nGapSteps > MAX_GAP_STEPS) {
      throw new InputError(
        `${source}: run ${quote(runIds[r])} must miss at most ${MAX_GAP_STEPS} steps, got ${nGapSteps} missing ` +
          `between step ${firstStep} and step ${lastStep} (is the step column a sample index?)`,
      );
    }
    totalSteps += nSteps;
    if (totalSteps > limit) {
      throw new InputError(
        `${source}: runs must span at most ${limit} steps in all (${STEPS_PER_ROW} per row + ${STEPS_BASE}, at most ` +
          `${MAX_TOTAL_STEPS}; gaps count), got ${totalSteps} by run ${quote(runIds[r])} (steps ${firstStep} to ${lastStep} ` +
          `in ${rowsOfRun.length} rows; is the step column a sample index?)`,
      );
    }
    nStepsOfRun[r] = nSteps;
  }

  // Pass 4: lay each run's readings out by step (gaps as dropouts), or only its rows (`fillGaps: false`).
  const fillGaps = options.fillGaps ?? true;
  const runs: RunSequence[] = [];
  for (let r = 0; r < nRuns; r++) {
    const rowsOfRun = order.subarray(start[r], start[r + 1]);
    const firstStep = stepOfRow[rowsOfRun[0]];
    const nSteps = nStepsOfRun[r];
    const size = fillGaps ? nSteps : rowsOfRun.length;
    const obs = new Int32Array(size).fill(DROPOUT);
    const rows = new Int32Array(size).fill(-1);
    let nDropouts = 0;
    let nUnknown = 0;
    for (let k = 0; k < rowsOfRun.length; k++) {
      const row = rowsOfRun[k];
      const t = fillGaps ? stepOfRow[row] - firstStep : k;
      rows[t] = row;
      const code = codeOfRow[row];
      if (code >= 0) obs[t] = code;
      else if (code === DROPOUT) nDropouts++;
      else nUnknown++;
    }
    runs.push({ id: runIds[r], firstStep, nSteps, obs, rows, nDropouts, nGapSteps: nSteps - rowsOfRun.length, nUnknown });
  }

  let totalGaps = 0;
  let totalAll = 0;
  for (const run of runs) {
    totalGaps += run.nGapSteps;
    totalAll += run.nSteps;
  }
  if (totalGaps > GAP_WARNING_SHARE * totalAll) {
    warnings.push(
      `${source}: ${totalGaps} of ${totalAll} steps (${((100 * totalGaps) / totalAll).toFixed(1)} %) are missing from the table and count as dropouts` +
        (period !== null ? ` (period ${formatPeriod(period)}; is it right?)` : ''),
    );
  }
  if (repaired.size > 0) {
    let total = 0;
    for (const n of repaired.values()) total += n;
    const byCount = [...repaired].sort((a, b) => b[1] - a[1]).map(([what, n]) => `${what} (${n})`);
    warnings.push(`${source}: ${total} ${total === 1 ? 'reading was' : 'readings were'} repaired (spaces or letter case): ${listForMessage(byCount, 6)}`);
  }
  if (unknownLabels.size > 0) {
    let total = 0;
    for (const n of unknownLabels.values()) total += n;
    const byCount = [...unknownLabels].sort((a, b) => b[1] - a[1]).map(([label, n]) => `${quote(label)} (${n})`);
    warnings.push(
      `${source}: ${total} ${total === 1 ? 'reading' : 'readings'} not among the floor's surfaces became dropouts: ` +
        listForMessage(byCount, 10),
    );
  }
  return {
    source,
    nRows,
    columns: input.columns,
    runs,
    runCol: input.runCol,
    stepCol: input.stepCol,
    readingCol: input.readingCol,
    ...(timeCol !== undefined && period !== null ? { timeCol, period } : {}),
    warnings,
  };
}

/**
 * The period that best fits the times (least squares over all runs, each run with its own start) once
 * readings are given steps by `rough` (the median spacing). The median alone is biased by dropped
 * readings (a missing reading doubles a spacing) and its error grows along a run (0.5 % off is half a
 * period after 100 steps); the fitted slope is not. Steps are assigned from the previous reading
 * (round of the spacing), so jitter does not accumulate either. Kept when the fit is not usable.
 */
function refinePeriod(timeOfRow: Float64Array, order: Int32Array, start: Int32Array, rough: number): number {
  let sxy = 0;
  let sxx = 0;
  for (let r = 0; r + 1 < start.length; r++) {
    const n = start[r + 1] - start[r];
    if (n < 2) continue;
    const t0 = timeOfRow[order[start[r]]];
    const ks = new Float64Array(n);
    let k = 0;
    let kSum = 0;
    let tSum = 0;
    for (let i = 0; i < n; i++) {
      const t = timeOfRow[order[start[r] + i]] - t0;
      if (i > 0) k += Math.max(1, Math.round((t - (timeOfRow[order[start[r] + i - 1]] - t0)) / rough));
      ks[i] = k;
      kSum += k;
      tSum += t;
    }
    const kMean = kSum / n;
    const tMean = tSum / n;
    for (let i = 0; i < n; i++) {
      const dk = ks[i] - kMean;
      sxy += dk * (timeOfRow[order[start[r] + i]] - t0 - tMean);
      sxx += dk * dk;
    }
  }
  const fitted = sxy / sxx;
  return sxx > 0 && fitted > 0 && Math.abs(fitted - rough) < 0.25 * rough ? fitted : rough;
}

/** Above this share of gap steps (steps missing from the table) among all steps, reading warns. */
export const GAP_WARNING_SHARE = 0.05;

/**
 * Maps each row's time to a step: per run, rows sorted by time (stable), step = round((t − t_first) /
 * period − phase), the phase being the circular mean of the run's readings within a period (so
 * the first reading's jitter does not shift the run), steps counted from 0 at the first reading. The period is `given` (seconds) or, when absent, the median of the positive spacings between
 * consecutive readings of the same run over all runs. Two readings of a run rounding to the same step
 * are an error naming the run and both times (readings are never dropped silently).
 */
function timesToSteps(
  input: KeyedRows,
  timeCol: string,
  timeOfRow: Float64Array,
  order: Int32Array,
  start: Int32Array,
  runIds: string[],
  given: number | undefined,
): { steps: Float64Array; period: number; inferred: boolean } {
  const { source, locate } = input;
  const nRuns = runIds.length;
  for (let r = 0; r < nRuns; r++) {
    const rowsOfRun = order.subarray(start[r], start[r + 1]);
    let sorted = true;
    for (let k = 1; k < rowsOfRun.length && sorted; k++) sorted = timeOfRow[rowsOfRun[k]] >= timeOfRow[rowsOfRun[k - 1]];
    if (!sorted) rowsOfRun.sort((a, b) => timeOfRow[a] - timeOfRow[b] || a - b);
  }
  let period = given ?? NaN;
  const inferred = given === undefined;
  if (inferred) {
    const spacings = new Float64Array(Math.max(0, order.length - nRuns));
    let n = 0;
    for (let r = 0; r < nRuns; r++) {
      for (let k = start[r] + 1; k < start[r + 1]; k++) {
        const d = timeOfRow[order[k]] - timeOfRow[order[k - 1]];
        if (d > 0) spacings[n++] = d;
      }
    }
    if (n === 0) {
      throw new InputError(
        `${source}: the period must be given with --period when no run has two readings at different times, got none in column ${quote(timeCol)}`,
      );
    }
    const used = spacings.subarray(0, n).sort();
    const median = n % 2 === 1 ? used[(n - 1) / 2] : (used[n / 2 - 1] + used[n / 2]) / 2;
    period = refinePeriod(timeOfRow, order, start, median);
  }
  const steps = new Float64Array(timeOfRow.length);
  const timeText = (row: number) => {
    const raw = input.stepAt(row);
    if (input.describeTime && typeof raw === 'number') return input.describeTime(raw);
    return typeof raw === 'string' ? raw : String(raw);
  };
  for (let r = 0; r < nRuns; r++) {
    const first = timeOfRow[order[start[r]]];
    // The run's grid phase: the circular mean of the readings' positions within a period, so the
    // jitter of the first reading does not shift every step of the run.
    let c = 0;
    let sn = 0;
    for (let k = start[r]; k < start[r + 1]; k++) {
      const angle = 2 * Math.PI * ((timeOfRow[order[k]] - first) / period);
      c += Math.cos(angle);
      sn += Math.sin(angle);
    }
    const phase = c === 0 && sn === 0 ? 0 : Math.atan2(sn, c) / (2 * Math.PI);
    const stepAt = (row: number) => Math.round((timeOfRow[row] - first) / period - phase);
    const base = stepAt(order[start[r]]);
    let lastStep = -1;
    for (let k = start[r]; k < start[r + 1]; k++) {
      const row = order[k];
      const step = stepAt(row) - base;
      if (!Number.isSafeInteger(step)) {
        throw new InputError(
          `${source}: times of run ${quote(runIds[r])} must lie within a safe number of periods of the run's first time, got ${timeText(row)} at ${locate(row)} for period ${formatPeriod(period)}`,
        );
      }
      if (step === lastStep) {
        const prev = order[k - 1];
        throw new InputError(
          `${source}: readings of run ${quote(runIds[r])} must fall on different steps of period ${formatPeriod(period)}, ` +
            `got times ${timeText(prev)} (${locate(prev)}) and ${timeText(row)} (${locate(row)}) both on step ${step} (is --period right?)`,
        );
      }
      steps[row] = step;
      lastStep = step;
    }
  }
  return { steps, period, inferred };
}
