import { nonNegative, unitInterval } from './tidy-number.js';
import { InputError, quote } from '../errors.js';
import { decodeMoveRun } from '../decode/decode-move-run.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { logChain } from '../decode/log-chain.js';
import type { DecodedRun } from '../decode/decode-run.js';
import { decodeLanes } from '../decode/decode-lanes.js';
import { logLanes } from '../decode/log-lanes.js';
import { LANES } from '../kernels/sparse-chain.js';
import { summarizeRun, flagText, FLAG_DROPOUT, FLAG_IMPOSSIBLE, FLAG_LOW_CONFIDENCE, FLAG_SURPRISING, type RunSummary } from '../decode/summarize-run.js';

/** The boolean flag columns of the annotated table and the flag bit each shows (after the position columns). */
export const FLAG_COLUMNS: Array<[string, number]> = [
  ['flag_dropout', FLAG_DROPOUT],
  ['flag_low_confidence', FLAG_LOW_CONFIDENCE],
  ['flag_surprising', FLAG_SURPRISING],
  ['flag_impossible', FLAG_IMPOSSIBLE],
];
import { positionLayout } from '../decode/position-layout.js';
import { summarizeZones, type ZoneSummary } from '../decode/summarize-zones.js';
import { positionColumns } from './position-columns.js';
import type { DecodeThresholds } from '../decode/decode-thresholds.js';
import type { RunsTable } from '../io/runs-table.js';
import type { OutputTable, OutputColumn } from '../io/output-table.js';

export interface DecodedTables {
  annotated: OutputTable;
  summary: OutputTable;
  summaries: Array<RunSummary & ZoneSummary & { run: string; split: string }>;
  /** Runs impossible under the model, for a warning. */
  impossibleRuns: string[];
}

/**
 * Decodes every run of the tables and builds the annotated table (every input row in input order, input
 * columns first, then the contract's columns) and the run summary. `splitOf` tells each run's split.
 * Steps that were missing from the input (gaps) are decoded as dropouts but have no input row, so they
 * appear in the summary's counts only (`gap_steps`). The zone and position columns come after the
 * contract's first columns (`position-columns.ts`); zone columns are empty when the model has no zones.
 */
export function decodeRuns(
  model: HmmModel,
  tables: RunsTable[],
  th: DecodeThresholds,
  splitOf: (run: string) => string,
  /** Odometry bins of run `run` of table `table`, when the runs carry movement columns. */
  movesOf?: (table: number, run: number) => MoveSteps | undefined,
): DecodedTables {
  checkStepColumnFree(tables);
  const chain = chainFromModel(model);
  const log = logChain(chain);
  const layout = positionLayout(model);
  const nRows = tables.reduce((s, t) => s + t.nRows, 0);
  const pathCell = new Int32Array(nRows).fill(-1);
  const pathP = new Float64Array(nRows).fill(NaN);
  const likelyCell = new Int32Array(nRows).fill(-1);
  const likelyP = new Float64Array(nRows).fill(NaN);
  const entropy = new Float64Array(nRows).fill(NaN);
  const surprise = new Float64Array(nRows).fill(NaN);
  const flags = new Uint8Array(nRows);
  const likelyZone = new Int32Array(nRows).fill(-1);
  const zoneP = new Float64Array(nRows).fill(NaN);
  const meanLevel = new Int32Array(nRows).fill(-1);
  const meanX = new Float64Array(nRows).fill(NaN);
  const meanY = new Float64Array(nRows).fill(NaN);
  const spread = new Float64Array(nRows).fill(NaN);
  const summaries: DecodedTables['summaries'] = [];
  const impossibleRuns: string[] = [];
  // Every run, with its first row in the stacked tables and its odometry (when the model uses it).
  const entries: Array<{ run: RunsTable['runs'][number]; base: number; moves: MoveSteps | undefined }> = [];
  let base = 0;
  for (const [ti, table] of tables.entries()) {
    for (const [ri, run] of table.runs.entries()) entries.push({ run, base, moves: chain.move ? movesOf?.(ti, ri) : undefined });
    base += table.nRows;
  }
  const rowSummaries: Array<DecodedTables['summaries'][number]> = new Array(entries.length);
  const impossible = new Uint8Array(entries.length);
  const take = (index: number, dec: DecodedRun): void => {
    const { run, base } = entries[index];
    const stepFlags = new Uint8Array(run.obs.length);
    const summary = summarizeRun(run.obs, dec, th, stepFlags);
    rowSummaries[index] = { run: run.id, split: splitOf(run.id), ...summary, ...summarizeZones(run.rows, dec, th, layout.hasZones) };
    const pos = dec.positions!;
    if (dec.logLik === -Infinity) impossible[index] = 1;
    for (let t = 0; t < run.obs.length; t++) {
      const row = run.rows[t];
      if (row < 0) continue;
      const g = base + row;
      pathCell[g] = dec.path[t];
      pathP[g] = unitInterval(dec.pathP[t]);
      likelyCell[g] = dec.likelyCell[t];
      likelyP[g] = unitInterval(dec.likelyP[t]);
      entropy[g] = nonNegative(dec.entropyBits[t]);
      surprise[g] = nonNegative(dec.surpriseBits[t]);
      flags[g] = stepFlags[t];
      likelyZone[g] = pos.likelyZone[t];
      zoneP[g] = unitInterval(pos.zoneP[t]);
      meanLevel[g] = pos.meanLevel[t];
      meanX[g] = pos.meanX[t];
      meanY[g] = pos.meanY[t];
      spread[g] = nonNegative(pos.spreadM[t]);
    }
  };
  // Runs without odometry in lane groups of eight of similar length (the same numbers as one at a time);
  // runs with odometry one at a time.
  const plain: number[] = [];
  entries.forEach((e, index) => {
    if (e.moves) take(index, decodeMoveRun(chain, log, e.run.obs, e.moves, { positions: layout.groups }));
    else plain.push(index);
  });
  plain.sort((a, b) => entries[a].run.obs.length - entries[b].run.obs.length || a - b);
  const lanes = logLanes(chain, log);
  for (let g = 0; g < plain.length; g += LANES) {
    const members = plain.slice(g, g + LANES);
    const decoded = decodeLanes(
      chain,
      lanes,
      members.map((index) => entries[index].run.obs),
      { positions: layout.groups },
    );
    members.forEach((index, k) => take(index, decoded[k]));
  }
  rowSummaries.forEach((s, index) => {
    summaries.push(s);
    if (impossible[index]) impossibleRuns.push(s.run);
  });
  const ids = model.cells.map((c) => c.id);
  const num = (a: Float64Array) => (row: number) => (Number.isNaN(a[row]) ? null : a[row]);
  // Cell columns are dictionary-encoded over the model's cell ids (one dictionary for every file of a model).
  const cell = (name: string, a: Int32Array): OutputColumn => ({
    name,
    kind: 'dictionary',
    dictionary: ids,
    code: (row) => a[row],
    get: (row) => (a[row] < 0 ? null : ids[a[row]]),
  });
  // The step of every row as parsed (whole numbers within ±2^53): the step column is written from it as
  // int64 whatever the input held (CSV text, any Arrow integer or float type, or steps mapped from --time-col).
  const stepOf = new Float64Array(nRows);
  let first = 0;
  for (const table of tables) {
    for (const run of table.runs) {
      for (let t = 0; t < run.rows.length; t++) if (run.rows[t] >= 0) stepOf[first + run.rows[t]] = run.firstStep + t;
    }
    first += table.nRows;
  }
  const stepColumn = (name: string): OutputColumn => ({ name, kind: 'int64', get: (row) => stepOf[row] });
  const timeCol = tables[0].timeCol;
  const { runCol, readingCol } = tables[0];
  const inputColumns: OutputColumn[] = tables[0].columns.map((c, k): OutputColumn => {
    const get = tables.length === 1 ? (row: number) => c.get(row) : spanning(tables, k);
    if (timeCol === undefined && c.name === tables[0].stepCol) return stepColumn(c.name);
    // Run ids and readings given as text are stored dictionary-encoded (few distinct values, many rows).
    if ((c.name === runCol || c.name === readingCol) && c.kind === 'utf8') return { name: c.name, kind: 'dictionary', get };
    return { name: c.name, kind: 'passthrough', arrowType: c.arrowType, get };
  });
  // Steps mapped from times (--time-col) are written as their own column, named by --step-col.
  const stepColumns: OutputColumn[] = timeCol === undefined ? [] : [stepColumn(tables[0].stepCol)];
  const annotated: OutputTable = {
    nRows,
    columns: [
      ...inputColumns,
      ...stepColumns,
      cell('path_cell', pathCell),
      { name: 'path_p', kind: 'float64', get: num(pathP) },
      cell('likely_cell', likelyCell),
      { name: 'likely_p', kind: 'float64', get: num(likelyP) },
      { name: 'entropy_bits', kind: 'float64', get: num(entropy) },
      { name: 'surprise_bits', kind: 'float64', get: num(surprise) },
      { name: 'flag', kind: 'dictionary', get: (row) => flagText(flags[row]) },
      ...positionColumns(model, layout, { pathCell, likelyZone, zoneP, meanLevel, meanX, meanY, spread }),
      // Each flag as its own boolean column (the `flag` text kept above), for tools that filter on booleans.
      // No `arrowType`: its values are all booleans, so Arrow and Parquet store it as Bool / BOOLEAN, and
      // naming the type would load Apache Arrow at every start-up.
      ...FLAG_COLUMNS.map(([name, bit]): OutputColumn => ({ name, kind: 'passthrough', get: (row) => (flags[row] & bit) !== 0 })),
    ],
  };
  const finite = (v: number) => (Number.isFinite(v) ? v : null);
  const summary: OutputTable = {
    nRows: summaries.length,
    columns: [
      { name: 'run', kind: 'utf8', get: (r) => summaries[r].run },
      { name: 'steps', kind: 'int32', get: (r) => summaries[r].steps },
      { name: 'dropouts', kind: 'int32', get: (r) => summaries[r].dropouts },
      { name: 'split', kind: 'utf8', get: (r) => summaries[r].split },
      { name: 'loglik', kind: 'float64', get: (r) => finite(summaries[r].loglik) },
      { name: 'loglik_per_reading', kind: 'float64', get: (r) => finite(summaries[r].loglikPerReading) },
      { name: 'path_logprob', kind: 'float64', get: (r) => finite(summaries[r].pathLogprob) },
      { name: 'mean_path_p', kind: 'float64', get: (r) => finite(unitInterval(summaries[r].meanPathP)) },
      { name: 'low_confidence_steps', kind: 'int32', get: (r) => summaries[r].lowConfidenceSteps },
      { name: 'surprising_steps', kind: 'int32', get: (r) => summaries[r].surprisingSteps },
      { name: 'gap_steps', kind: 'int32', get: (r) => summaries[r].gapSteps },
      { name: 'mean_zone_p', kind: 'float64', get: (r) => finite(unitInterval(summaries[r].meanZoneP)) },
      { name: 'low_confidence_zone_steps', kind: 'int32', get: (r) => (layout.hasZones ? summaries[r].lowConfidenceZoneSteps : null) },
    ],
  };
  return { annotated, summary, summaries, impossibleRuns };
}

/** A column that reads row `g` from whichever table holds it (tables stacked in order). */
function spanning(tables: RunsTable[], k: number): (row: number) => string | number | bigint | boolean | null {
  const starts = [0];
  for (const t of tables) starts.push(starts[starts.length - 1] + t.nRows);
  return (row) => {
    let i = 0;
    while (row >= starts[i + 1]) i++;
    return tables[i].columns[k].get(row - starts[i]);
  };
}

/**
 * With --time-col the annotated table gains the mapped steps as a column named by --step-col: no runs
 * table may already have a column of that name (checked before any decoding).
 */
export function checkStepColumnFree(tables: RunsTable[]): void {
  const timed = tables.find((t) => t.timeCol !== undefined);
  if (!timed) return;
  const clash = tables.find((t) => t.columns.some((c) => c.name === t.stepCol));
  if (clash) {
    throw new InputError(
      `${clash.source}: the step column written for --time-col must be a new column, got ${quote(clash.stepCol)} already in the runs table (name another with --step-col)`,
    );
  }
}
