/**
 * A runs table as read from CSV or Arrow (see docs/formats.md, "Runs table"): the readings of each run as
 * integer codes, plus every input column kept for pass-through to the annotated output.
 */
import type { DataType } from 'apache-arrow';

/** Reading code for "no reading" (an empty/null cell, a lost sample, or an unknown label on request). */
export const DROPOUT = -1;

export interface RunSequence {
  /** Run id as written in the file. */
  id: string;
  /** First step number of the run (the smallest `step` value). */
  firstStep: number;
  /** Steps from the first to the last, gaps included (`obs.length` unless read with `fillGaps: false`). */
  nSteps: number;
  /**
   * Reading code per step, index `t` = step `firstStep + t`; `DROPOUT` (-1) for an empty reading or a
   * step missing from the file (a gap). Codes index `surfaces`. Read with `fillGaps: false`: one code
   * per row of the run, in step order, gaps left out.
   */
  obs: Int32Array;
  /** For each step, the row of the input table it came from, or -1 for a gap-filled step (per `obs`). */
  rows: Int32Array;
  /** Empty/null readings in the file (not counting gaps). */
  nDropouts: number;
  /** Steps filled in because they were missing from the file. */
  nGapSteps: number;
  /** Readings not in the alphabet turned into dropouts (`unknownReadings: 'dropout'` only). */
  nUnknown: number;
}

/** One input column, kept as read, for pass-through. */
export interface InputColumn {
  name: string;
  /** Value per input row; `null` for an empty/null value. */
  get(row: number): string | number | bigint | boolean | null;
  /** Arrow type name when read from Arrow (kept so the output can use the same type), else 'utf8'. */
  kind: 'utf8' | 'number' | 'other';
  /** The Arrow type when read from Arrow, so an Arrow output can keep it (see `OutputColumn.arrowType`). */
  arrowType?: DataType;
}

export interface RunsTable {
  /** Path (or label) it was read from, for messages. */
  source: string;
  nRows: number;
  /** Every input column in file order (including run/step/reading). */
  columns: InputColumn[];
  /** Runs in order of first appearance in the file. */
  runs: RunSequence[];
  /** Names of the run, step and reading columns actually used. */
  runCol: string;
  stepCol: string;
  readingCol: string;
  /** The time column steps were mapped from, and the period in seconds (`timeCol` option only). */
  timeCol?: string;
  period?: number;
  /** Non-fatal findings (e.g. unknown readings turned into dropouts), for the CLI to print. */
  warnings: string[];
}

export interface ReadRunsOptions {
  /** Reading alphabet (the floor's `surfaces`). */
  surfaces: string[];
  /** @default 'run' */
  runCol?: string;
  /** @default 'step' */
  stepCol?: string;
  /** @default 'reading' */
  readingCol?: string;
  /**
   * A time column to map to steps (`--time-col`) instead of a step column: step = round((t − t_first) /
   * period) per run. Numbers are seconds; text is numbers or ISO 8601; Arrow timestamps and dates.
   */
  timeCol?: string;
  /** The sampling period in seconds (`--period`); inferred from the median spacing when absent. */
  period?: number;
  /** @default 'error' */
  unknownReadings?: 'error' | 'dropout';
  /**
   * False: lay out only the steps present in the file (`obs`/`rows` per row, `nSteps` still counts the
   * gaps), for figures that need no per-step memory (`check`). @default true
   */
  fillGaps?: boolean;
  /**
   * Rows and steps (gaps included) of the runs tables read before this one in the same command, so the
   * limit on steps (`maxTotalSteps`) holds over all of them. @default none
   */
  prior?: { rows: number; steps: number };
}
