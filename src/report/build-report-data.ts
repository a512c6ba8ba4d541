import { TOOL_VERSION } from '../version.js';
import type { ReportData, ReportInputs, RunRow, ChangeRow } from './report-data.js';
import { floorGeometry } from './floor-geometry.js';
import { expectedVisits } from './expected-visits.js';
import { meanConfidenceByCell } from './mean-confidence-by-cell.js';
import { runRowsFromAnnotated } from './run-rows-from-annotated.js';
import { findDisagreements } from './find-disagreements.js';
import { estimateAmbiguity, DEFAULT_AMBIGUITY_OPTIONS, type AmbiguityOptions } from './estimate-ambiguity.js';

/** Simulated run length bounds when it is taken from the real runs. */
const MIN_SIM_STEPS = 50;
const MAX_SIM_STEPS = 2000;

/**
 * Everything the report shows, computed from what was read: the floor's geometry; expected readings per
 * cell (from the annotated runs, else from the fit record); mean decoding confidence per cell; per-run
 * rows (from the summary, else rebuilt from the annotated table); the cells that read unlike their
 * survey; and the localization ambiguity, simulated with runs as long as the real ones (their median)
 * and their dropout rate unless the options say otherwise.
 */
export function buildReportData(inputs: ReportInputs): ReportData {
  const { modelFile, annotated } = inputs;
  const model = modelFile.model;
  const fit = modelFile.fit;
  const notes: string[] = [];
  const n = model.cells.length;

  let visits: Float64Array | null = null;
  let visitsFrom: ReportData['visitsFrom'] = null;
  let confidence: Float64Array | null = null;
  let pathSteps: Float64Array | null = null;
  let nAnnotatedReadings: number | null = null;
  let runRows: RunRow[] | null = inputs.runRows;
  let runRowsFrom: ReportData['runRowsFrom'] = runRows ? 'summary' : null;
  const heldOut = new Set(fit?.split.heldOut ?? []);
  const fitted = new Set(fit?.split.fit ?? []);
  const splitOf = (run: string): string => (heldOut.has(run) ? 'held-out' : fitted.has(run) ? 'fit' : fit ? 'unseen' : '');

  if (annotated) {
    const ev = expectedVisits(model, annotated.runs);
    visits = ev.readings;
    visitsFrom = 'annotated';
    if (ev.impossibleRuns.length) {
      notes.push(`${ev.impossibleRuns.length} run(s) of the annotated table are impossible under the model and are left out of the visit shares: ${ev.impossibleRuns.slice(0, 5).join(', ')}${ev.impossibleRuns.length > 5 ? ', …' : ''}`);
    }
    const conf = meanConfidenceByCell(model, annotated);
    confidence = conf.meanPathP;
    pathSteps = conf.steps;
    nAnnotatedReadings = annotated.runs.reduce((s, r) => s + r.obs.reduce((a, o) => a + (o >= 0 ? 1 : 0), 0), 0);
    if (!runRows) {
      runRows = runRowsFromAnnotated(annotated, splitOf);
      runRowsFrom = 'annotated';
    }
  } else {
    // Expected readings per cell recorded with the fit (newer model files), when present.
    const recorded = (fit as { cellReadings?: number[][] } | null)?.cellReadings;
    if (recorded && recorded.length === n) {
      visits = Float64Array.from(recorded, (row) => row.reduce((a, b) => a + b, 0));
      visitsFrom = 'model';
    }
  }

  let changes: Array<ChangeRow | null> | null = null;
  if (inputs.changes) {
    const byId = new Map(inputs.changes.map((c) => [c.cell, c] as const));
    changes = model.cells.map((c) => byId.get(c.id) ?? null);
  }

  const simOptions: Partial<AmbiguityOptions> = { ...inputs.ambiguity };
  if (runRows?.length) {
    const steps = runRows.map((r) => r.steps).sort((a, b) => a - b);
    const median = steps[Math.floor((steps.length - 1) / 2)];
    if (simOptions.steps === undefined) simOptions.steps = Math.min(MAX_SIM_STEPS, Math.max(MIN_SIM_STEPS, median));
    const totalSteps = runRows.reduce((s, r) => s + r.steps, 0);
    if (simOptions.dropoutRate === undefined && totalSteps > 0) simOptions.dropoutRate = runRows.reduce((s, r) => s + r.dropouts, 0) / totalSteps;
  }
  const ambiguity = estimateAmbiguity(model, { ...DEFAULT_AMBIGUITY_OPTIONS, ...simOptions });

  return {
    title: modelFile.name || inputs.floor?.name || '',
    toolVersion: TOOL_VERSION,
    modelFile,
    geometry: floorGeometry(model),
    visits,
    visitsFrom,
    confidence,
    pathSteps,
    changes,
    changeRows: inputs.changes,
    disagreements: findDisagreements(model),
    ambiguity,
    runRows,
    runRowsFrom,
    nAnnotatedReadings,
    sources: inputs.sources,
    notes,
  };
}
