import { readPipeline } from '../io/read-pipeline.js';
import { readModel } from '../io/read-model.js';
import { checkReadable } from '../io/check-readable.js';
import { planOutputs } from '../io/plan-outputs.js';
import type { FitProgress } from '../fit/fit-model.js';
import { DEFAULT_KEY_COLUMNS, type KeyColumns } from './key-columns.js';
import { resolveFitOptions } from './resolve-fit-options.js';
import { fitFromFiles, type FitOutcome } from './fit-from-files.js';
import type { QueueWait } from './queue-engine-for.js';
import { decodeFromFiles, type DecodeOutcome } from './decode-from-files.js';
import { reportToFile } from './report-to-file.js';
import { compareFromFiles, type CompareOutcome, type CompareProgress } from './compare-from-files.js';
import { resolveCompareOptions } from './resolve-compare-options.js';
import { resolveDecodeOptions } from './resolve-decode-options.js';
import { parsePeriod } from '../io/parse-time.js';

export interface PipelineOutcome {
  fit: FitOutcome | null;
  compare: CompareOutcome | null;
  decode: DecodeOutcome | null;
  written: string[];
  warnings: string[];
}

/**
 * `run PIPELINE.json`: read → fit (or load a saved model, or re-fit it after flooring changes with
 * `compare`) → select → decode → write. Everything the pipeline names is checked before any work
 * starts, so a bad pipeline writes nothing. After `compare`, decoding and the report use the re-fitted
 * model, and the report shows the changed cells.
 */
export async function runPipeline(
  path: string,
  onProgress?: (p: FitProgress | CompareProgress) => void,
  overrides: { workers?: number; signal?: AbortSignal; onQueueWait?: (wait: QueueWait) => void } = {},
): Promise<PipelineOutcome> {
  const p = await readPipeline(path);
  const keys: KeyColumns = {
    runCol: p.columns.run ?? DEFAULT_KEY_COLUMNS.runCol,
    stepCol: p.columns.step ?? DEFAULT_KEY_COLUMNS.stepCol,
    readingCol: p.columns.reading ?? DEFAULT_KEY_COLUMNS.readingCol,
    unknownReadings: p.columns.unknownReadings ?? 'error',
    ...(p.columns.movedCol ? { movedCol: p.columns.movedCol } : {}),
    ...(p.columns.headingCol ? { headingCol: p.columns.headingCol } : {}),
    ...(p.columns.timeCol ? { timeCol: p.columns.timeCol } : {}),
    ...(p.columns.period ? { period: parsePeriod(p.columns.period) } : {}),
  };
  const fitOpts = p.fit ? resolveFitOptions({ ...p.fit, ...(overrides.workers ? { workers: overrides.workers } : {}) }, p.source, (k) => `"fit.${k}"`) : null;
  const compareOpts = p.compare
    ? resolveCompareOptions({ ...p.compare, ...(overrides.workers ? { workers: overrides.workers } : {}) }, p.source, (k) => `"compare.${k}"`)
    : null;
  // Checked by the same validator as `decode`'s flags, before any file is touched.
  const thresholds = resolveDecodeOptions({ ...(p.decode ?? {}) }, p.source, (k) => `"decode.${k}"`);
  await checkReadable(p.floor, 'floor file');
  for (const r of p.runs) await checkReadable(r, 'runs table');
  if (p.model) await checkReadable(p.model, 'model file');
  if (fitOpts?.from) await checkReadable(fitOpts.from, 'warm-start model');
  // No output may replace an input (the pipeline file itself included) or another output.
  await planOutputs(
    p.source,
    [
      { path: p.source, what: 'the pipeline file' },
      { path: p.floor, what: '"floor"' },
      ...p.runs.map((r) => ({ path: r, what: '"runs"' })),
      { path: p.model, what: '"model"' },
      { path: fitOpts?.from, what: '"fit.from"' },
    ],
    (['model', 'annotated', 'summary', 'report', 'changes', 'floor'] as const).map((k) => ({ path: p.out[k], what: `"out.${k}"` })),
  );
  const written: string[] = [];
  const warnings: string[] = [];
  let fit: FitOutcome | null = null;
  if (fitOpts) {
    fit = await fitFromFiles(
      { floor: p.floor, runs: p.runs, out: p.out.model!, from: fitOpts.from, options: fitOpts.options, workers: fitOpts.workers, keys, signal: overrides.signal, queue: fitOpts.queue, onQueueWait: overrides.onQueueWait },
      onProgress,
    );
    written.push(p.out.model!);
    warnings.push(...fit.warnings);
  }
  let compare: CompareOutcome | null = null;
  if (compareOpts) {
    compare = await compareFromFiles(
      {
        model: p.model!,
        floor: p.floor,
        runs: p.runs,
        out: p.out.changes!,
        refit: p.out.model,
        writeFloor: p.out.floor,
        compare: compareOpts.compare,
        fit: compareOpts.fit,
        workers: compareOpts.workers,
        nullDraws: compareOpts.nullDraws,
        search: compareOpts.search,
        keys,
      },
      onProgress,
    );
    written.push(p.out.changes!);
    if (p.out.model) written.push(p.out.model);
    if (p.out.floor) written.push(p.out.floor);
    warnings.push(...compare.warnings);
  }
  // The model to decode with and report on: the one just fitted or re-fitted (and written), else the saved one.
  const usedModel = fit ? fit.file : compare ? compare.refit : null;
  const usedPath = usedModel ? p.out.model! : p.model!;
  let decode: DecodeOutcome | null = null;
  if (p.out.annotated || p.out.summary) {
    const model = usedModel ?? (await readModel(p.model!));
    const annotated = p.out.annotated;
    decode = await decodeFromFiles(
      { model: usedPath, floor: p.floor, runs: p.runs, out: annotated ?? '', summary: p.out.summary, thresholds, keys },
      model,
      annotated === null,
    );
    if (annotated) written.push(annotated);
    if (p.out.summary) written.push(p.out.summary);
    warnings.push(...decode.warnings.filter((w) => !warnings.includes(w)));
  }
  if (p.out.report) {
    const report = await reportToFile(
      { model: usedPath, floor: p.floor, annotated: p.out.annotated, summary: p.out.summary, changes: p.out.changes, out: p.out.report, keys, ambiguity: {} },
      usedModel ?? undefined,
    );
    written.push(p.out.report);
    warnings.push(...report.warnings.filter((w) => !warnings.includes(w)));
  }
  return { fit, compare, decode, written, warnings };
}
