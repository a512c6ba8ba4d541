import { dirname, extname, isAbsolute, relative, resolve } from 'node:path';
import { InputError, quote } from '../errors.js';
import { parseJsonDocument } from './parse-json-document.js';
import { checkKeys } from './json-fields.js';
import { parsePeriod } from './parse-time.js';
import { PIPELINE_FORMAT, type PipelineFile } from './pipeline-file.js';

const TOP_KEYS = ['format', 'floor', 'runs', 'columns', 'model', 'fit', 'compare', 'decode', 'out'];
const COLUMN_KEYS = ['run', 'step', 'reading', 'unknownReadings', 'movedCol', 'headingCol', 'timeCol', 'period'];
export const PIPELINE_FIT_KEYS = [
  'restarts', 'holdout', 'holdoutCol', 'seed', 'transitions', 'dwell', 'hit', 'priorStrength', 'transitionPriorStrength',
  'maxIter', 'tol', 'workers', 'finalPass', 'from', 'prune', 'queue', 'queueTimeout',
];
export const PIPELINE_COMPARE_KEYS = [
  'fdr', 'minReadings', 'nullDraws', 'robust', 'swapRounds', 'seed', 'transitions', 'priorStrength', 'maxIter', 'tol', 'workers',
];
const DECODE_KEYS = ['lowConfidence', 'surprisingBits'];
const OUT_KEYS = ['dir', 'model', 'annotated', 'summary', 'report', 'changes', 'floor'];
const TABLE_EXTENSIONS = ['.csv', '.arrow', '.feather', '.arrows', '.parquet'];
/** The extensions the tool writes for each `out` entry (checked before anything is read). */
const OUT_EXTENSIONS: Record<string, string[]> = {
  model: ['.json'],
  floor: ['.json'],
  annotated: TABLE_EXTENSIONS,
  summary: TABLE_EXTENSIONS,
  changes: TABLE_EXTENSIONS,
  report: ['.html', '.htm'],
};

/**
 * Reads the text of a pipeline file. Unknown keys anywhere are errors (a typo must not be silently
 * ignored); paths are resolved relative to the pipeline file's folder (`out` names relative to `out.dir`).
 * Values of `fit` and `compare` options are checked where they are used, with the same rules as the flags.
 */
export function parsePipeline(text: string, source: string): PipelineFile {
  const fail = (what: string): never => {
    throw new InputError(`${source}: ${what}`);
  };
  const doc = parseJsonDocument(text, source);
  const root = object(doc, 'the pipeline file', fail);
  if (root.format !== PIPELINE_FORMAT) fail(`"format" must be ${quote(PIPELINE_FORMAT)}, got ${quote(root.format)}`);
  keys(root, TOP_KEYS, 'the pipeline file', fail);
  const base = dirname(resolve(source));
  const floor = typeof root.floor === 'string' && root.floor ? resolve(base, root.floor) : fail(`"floor" must be a path, got ${quote(root.floor)}`);
  const runsRaw = typeof root.runs === 'string' ? [root.runs] : root.runs;
  if (!Array.isArray(runsRaw) || runsRaw.length === 0 || !runsRaw.every((r) => typeof r === 'string' && r)) {
    fail(`"runs" must be a path or a non-empty list of paths, got ${quote(root.runs)}`);
  }
  const runs = (runsRaw as string[]).map((r) => resolve(base, r));
  let columns: PipelineFile['columns'] = {};
  if (root.columns !== undefined) {
    const c = object(root.columns, '"columns"', fail);
    keys(c, COLUMN_KEYS, '"columns"', fail);
    for (const k of ['run', 'step', 'reading', 'movedCol', 'headingCol', 'timeCol'] as const) {
      if (c[k] !== undefined && (typeof c[k] !== 'string' || !c[k])) fail(`"columns.${k}" must be a column name, got ${quote(c[k])}`);
    }
    if (c.unknownReadings !== undefined && c.unknownReadings !== 'error' && c.unknownReadings !== 'dropout') {
      fail(`"columns.unknownReadings" must be "error" or "dropout", got ${quote(c.unknownReadings)}`);
    }
    if (c.period !== undefined) {
      if (c.timeCol === undefined) fail(`"columns.period" must come with "columns.timeCol", got ${quote(c.period)} alone`);
      if (typeof c.period !== 'string' || Number.isNaN(parsePeriod(c.period))) {
        fail(`"columns.period" must be a duration > 0 in ms or s (e.g. "100ms", "0.5s"), got ${quote(c.period)}`);
      }
    }
    columns = c as PipelineFile['columns'];
  }
  const model = root.model === undefined ? null : typeof root.model === 'string' && root.model ? resolve(base, root.model) : fail(`"model" must be a path, got ${quote(root.model)}`);
  let fit: Record<string, unknown> | null = null;
  if (root.fit !== undefined) {
    fit = { ...object(root.fit, '"fit"', fail) };
    keys(fit, PIPELINE_FIT_KEYS, '"fit"', fail);
    if (typeof fit.from === 'string') fit.from = resolve(base, fit.from);
  }
  let compare: Record<string, unknown> | null = null;
  if (root.compare !== undefined) {
    compare = { ...object(root.compare, '"compare"', fail) };
    keys(compare, PIPELINE_COMPARE_KEYS, '"compare"', fail);
  }
  if (fit && model) fail('"model" (decode with a saved model) and "fit" (calibrate a new one) must not both be given');
  if (fit && compare) fail('"fit" (calibrate from the survey) and "compare" (re-fit an old model after flooring changes) must not both be given');
  if (compare && !model) fail('"compare" must come with "model": the old model to re-fit and compare against');
  if (!fit && !model) fail('either "fit" (calibrate) or "model" (decode with a saved model) must be given');
  let decode: PipelineFile['decode'] = null;
  if (root.decode !== undefined) {
    const d = object(root.decode, '"decode"', fail);
    keys(d, DECODE_KEYS, '"decode"', fail);
    for (const k of DECODE_KEYS) if (d[k] !== undefined && (typeof d[k] !== 'number' || !Number.isFinite(d[k]))) fail(`"decode.${k}" must be a number, got ${quote(d[k])}`);
    decode = d as PipelineFile['decode'];
  }
  const o = object(root.out, '"out"', fail);
  keys(o, OUT_KEYS, '"out"', fail);
  const dir = typeof o.dir === 'string' && o.dir ? resolve(base, o.dir) : fail(`"out.dir" must be a folder path, got ${quote(o.dir)}`);
  const name = (k: string): string | null => {
    const v = o[k];
    if (v === undefined || v === null) return null;
    if (typeof v !== 'string' || !v) fail(`"out.${k}" must be a file name, got ${quote(v)}`);
    const path = resolve(dir, v as string);
    const inside = relative(dir, path);
    if (isAbsolute(v as string) || inside === '' || inside.startsWith('..') || isAbsolute(inside)) {
      fail(`"out.${k}" must be a file name inside "out.dir" (no absolute path, no ".." leading out of it), got ${quote(v)}`);
    }
    const allowed = OUT_EXTENSIONS[k];
    if (!allowed.includes(extname(path).toLowerCase())) {
      fail(`"out.${k}" must end in ${allowed.join(', ')}, got ${quote(v)}`);
    }
    return path;
  };
  const out = { dir, model: name('model'), annotated: name('annotated'), summary: name('summary'), report: name('report'), changes: name('changes'), floor: name('floor') };
  if (fit && !out.model) fail('"out.model" must name the model file to write when the pipeline fits');
  if (compare && !out.changes) fail('"out.changes" must name the changes table to write when the pipeline compares');
  if (compare && !out.model && (out.annotated || out.summary || out.report)) {
    fail('"out.model" must name the re-fitted model file when a "compare" pipeline also decodes or reports (they use the re-fitted model)');
  }
  if (!compare && (out.changes || out.floor)) fail(`"out.${out.changes ? 'changes' : 'floor'}" is written by a "compare" section, and the pipeline has none`);
  if (model && !fit && !compare && out.model) fail('"out.model" is written by "fit" or "compare", and the pipeline has neither');
  if (!out.annotated && !out.summary && !out.model && !out.report && !out.changes) fail('"out" must name at least one output (model, annotated, summary, report, changes)');
  return { source, floor, runs, columns, model, fit, compare, decode, out };
}

function object(v: unknown, where: string, fail: (w: string) => never): Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) fail(`${where} must be an object, got ${quote(v)}`);
  return v as Record<string, unknown>;
}

function keys(o: Record<string, unknown>, allowed: string[], where: string, fail: (w: string) => never): void {
  try {
    checkKeys(o, allowed, where);
  } catch (err) {
    fail((err as Error).message);
  }
}
