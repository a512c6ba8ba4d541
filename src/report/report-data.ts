/**
 * What the report is built from. The pipeline (`src/pipeline/report-to-file.ts`) reads the files into a
 * `ReportInputs`; `buildReportData` computes everything derived (expected visits, decoding confidence,
 * localization ambiguity); `renderReport` turns the result into one HTML string. No file access here.
 */
import type { FloorGraph } from '../model/floor-graph.js';
import type { ModelFile } from '../io/model-file.js';
import type { RunsTable } from '../io/runs-table.js';
import type { AmbiguityEstimate, AmbiguityOptions } from './estimate-ambiguity.js';
import type { FloorGeometry } from './floor-geometry.js';

/** One run as the Runs section shows it (from a run summary table, or derived from an annotated table). */
export interface RunRow {
  run: string;
  /** `fit`, `held-out`, `unseen`, or '' when unknown. */
  split: string;
  steps: number;
  dropouts: number;
  /** Natural log; NaN when the run has no readings or was impossible under the model. */
  loglikPerReading: number;
  meanPathP: number;
  lowConfidenceSteps: number;
  surprisingSteps: number;
}

export type Verdict = 'changed' | 'unchanged' | 'too-few-readings';

/** One row of a changes table (`compare`). */
export interface ChangeRow {
  cell: string;
  verdict: Verdict;
  surfaceBefore: string | null;
  surfaceAfter: string | null;
  expectedReadings: number;
  tvDistance: number;
  qValue: number;
  /** The region (`compare`'s `region` column: cells the runs cannot tell apart share one); null when absent. */
  region: string | null;
  /** The region's cells (`candidates`, `;`-separated in the table); [] when absent. */
  candidates: string[];
  /** `compare`'s plain sentence for the row; null when absent. */
  explanation: string | null;
}

/** Display names of the files a report was made from (shown in its footer). */
export interface ReportSources {
  model: string;
  floor: string | null;
  annotated: string | null;
  summary: string | null;
  changes: string | null;
}

/** Everything read from the input files. */
export interface ReportInputs {
  modelFile: ModelFile;
  floor: FloorGraph | null;
  /** The annotated table, read as a runs table (its input columns plus the decoded ones). */
  annotated: RunsTable | null;
  /** Rows of the run summary table, when given. */
  runRows: RunRow[] | null;
  changes: ChangeRow[] | null;
  sources: ReportSources;
  /** Options of the ambiguity simulation; unset ones get defaults (see `estimateAmbiguity`). */
  ambiguity: Partial<AmbiguityOptions>;
}

/** A cell whose most likely reading is not its surveyed surface. */
export interface Disagreement {
  cell: number;
  /** Index of the most likely reading. */
  likely: number;
  likelyP: number;
  /** Probability of the surveyed surface. */
  surveyedP: number;
}

/** Everything the renderer needs. */
export interface ReportData {
  title: string;
  toolVersion: string;
  modelFile: ModelFile;
  geometry: FloorGeometry;
  /** Expected readings per cell (sums to the readings counted); null without runs to count. */
  visits: Float64Array | null;
  /** Where `visits` came from, for the caption. */
  visitsFrom: 'annotated' | 'model' | null;
  /** Mean posterior of the decoded path's cell, per cell (NaN: never on a path); null without an annotated table. */
  confidence: Float64Array | null;
  /** Steps decoded onto each cell (with `confidence`). */
  pathSteps: Float64Array | null;
  /** Changes row per cell (null for cells the table does not list); null without a changes table. */
  changes: Array<ChangeRow | null> | null;
  /** Changes rows in the table's order. */
  changeRows: ChangeRow[] | null;
  disagreements: Disagreement[];
  ambiguity: AmbiguityEstimate;
  runRows: RunRow[] | null;
  /** Where `runRows` came from. */
  runRowsFrom: 'summary' | 'annotated' | null;
  /** Readings counted in the annotated table (non-dropout steps), when given. */
  nAnnotatedReadings: number | null;
  sources: ReportSources;
  /** Non-fatal findings, shown in the report and printed by the CLI. */
  notes: string[];
}
