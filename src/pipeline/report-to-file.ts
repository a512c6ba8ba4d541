import { basename } from 'node:path';
import { readModel } from '../io/read-model.js';
import { readFloor } from '../io/read-floor.js';
import { readRuns } from '../io/read-runs.js';
import { readInputFile } from '../io/read-input-file.js';
import { tableFormatOf } from '../io/table-format-of.js';
import { writeFileAtomic } from '../io/write-atomic.js';
import { planOutputs } from '../io/plan-outputs.js';
import type { ModelFile } from '../io/model-file.js';
import { InputError, quote } from '../errors.js';
import { checkModelFloor } from '../model/check-model-floor.js';
import { withFloorZones } from '../model/with-floor-zones.js';
import type { AmbiguityOptions } from '../report/estimate-ambiguity.js';
import type { ReportData } from '../report/report-data.js';
import { runRowsFromTable } from '../report/run-rows-from-table.js';
import { changeRowsFromTable } from '../report/change-rows-from-table.js';
import { buildReportData } from '../report/build-report-data.js';
import { renderReport } from '../report/render-report.js';
import type { KeyColumns } from './key-columns.js';

export interface ReportConfig {
  model: string;
  /** Floor file to check the model against (optional). */
  floor: string | null;
  /** Annotated table from `decode` (visit shares, decoding confidence; runs when no summary). */
  annotated: string | null;
  /** Run summary table from `decode --summary`. */
  summary: string | null;
  /** Changes table from `compare`. */
  changes: string | null;
  out: string;
  /** Key columns of the annotated table (as given to `decode`). */
  keys: KeyColumns;
  /** Ambiguity simulation options; unset ones come from the runs or the defaults. */
  ambiguity: Partial<AmbiguityOptions>;
}

export interface ReportOutcome {
  out: string;
  bytes: number;
  data: ReportData;
  warnings: string[];
}

/**
 * `report`: reads the model and whichever of floor, annotated table, run summary and changes table are
 * named, builds the report and writes one self-contained HTML file atomically. The output must end in
 * `.html` or `.htm` (so it is never mistaken for a table). `preloaded` skips reading the model again
 * (the `run` pipeline has it).
 */
export async function reportToFile(config: ReportConfig, preloaded?: ModelFile): Promise<ReportOutcome> {
  if (!/\.html?$/i.test(config.out)) throw new InputError(`${config.out}: the report file name must end in .html, got ${quote(basename(config.out))}`);
  await planOutputs(
    'report',
    [
      { path: config.model, what: '--model' },
      { path: config.floor, what: '--floor' },
      { path: config.annotated, what: '--annotated' },
      { path: config.summary, what: '--summary' },
      { path: config.changes, what: '--changes' },
    ],
    [{ path: config.out, what: '--out' }],
  );
  let modelFile = preloaded ?? (await readModel(config.model));
  const floor = config.floor ? await readFloor(config.floor) : null;
  if (floor && config.floor) {
    checkModelFloor(modelFile.model, config.model, floor, config.floor);
    modelFile = { ...modelFile, model: withFloorZones(modelFile.model, floor) };
  }
  const model = modelFile.model;
  const annotated = config.annotated
    ? await readRuns(config.annotated, { surfaces: model.surfaces, runCol: config.keys.runCol, stepCol: config.keys.stepCol, readingCol: config.keys.readingCol, unknownReadings: config.keys.unknownReadings, timeCol: config.keys.timeCol, period: config.keys.period })
    : null;
  const summary = config.summary
    ? runRowsFromTable((await import('../io/columns-from-bytes.js')).columnsFromBytes(await readInputFile(config.summary), tableFormatOf(config.summary), config.summary))
    : null;
  const changes = config.changes
    ? changeRowsFromTable((await import('../io/columns-from-bytes.js')).columnsFromBytes(await readInputFile(config.changes), tableFormatOf(config.changes), config.changes), model.cells.map((c) => c.id))
    : null;
  const name = (p: string | null): string | null => (p ? basename(p) : null);
  const data = buildReportData({
    modelFile,
    floor,
    annotated,
    runRows: summary,
    changes,
    sources: { model: basename(config.model), floor: name(config.floor), annotated: name(config.annotated), summary: name(config.summary), changes: name(config.changes) },
    ambiguity: config.ambiguity,
  });
  const html = renderReport(data);
  await writeFileAtomic(config.out, html);
  return { out: config.out, bytes: Buffer.byteLength(html, 'utf8'), data, warnings: [...(annotated?.warnings ?? []), ...data.notes] };
}
