/** A parsed `underfoot-pipeline/1` file (docs/formats.md, "Pipeline file"), paths already resolved. */
export interface PipelineFile {
  source: string;
  floor: string;
  runs: string[];
  /** Key columns of the runs tables (our addition; defaults run/step/reading). */
  columns: { run?: string; step?: string; reading?: string; unknownReadings?: 'error' | 'dropout'; movedCol?: string; headingCol?: string; timeCol?: string; period?: string };
  /** A saved model to decode with instead of fitting (decode-only pipelines). */
  model: string | null;
  /** Fit options in camelCase (`fit` flags), or null to skip fitting. */
  fit: Record<string, unknown> | null;
  /**
   * `compare` options in camelCase (`compare` flags; our addition): re-fit `model` on the runs after
   * flooring changes and test which cells changed. Null when the pipeline does not compare.
   */
  compare: Record<string, unknown> | null;
  decode: { lowConfidence?: number; surprisingBits?: number } | null;
  /**
   * `report`: the HTML report (our addition), written last. With `compare`: `model` is the re-fitted
   * model, `changes` the changes table, `floor` the floor with the changed cells' new surfaces.
   */
  out: { dir: string; model: string | null; annotated: string | null; summary: string | null; report: string | null; changes: string | null; floor: string | null };
}

export const PIPELINE_FORMAT = 'underfoot-pipeline/1';
