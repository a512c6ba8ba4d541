import { describe, it, expect } from 'vitest';
import { parsePipeline } from '../../src/io/parse-pipeline.js';

const base = {
  format: 'underfoot-pipeline/1',
  floor: 'floor.json',
  runs: ['new.csv'],
  model: 'old-model.json',
  compare: { fdr: 0.05, nullDraws: 2 },
  out: { dir: 'out', changes: 'changes.csv', model: 'refit.json', floor: 'floor-after.json' },
};
const parse = (doc: Record<string, unknown>) => parsePipeline(JSON.stringify(doc), '/data/p/pipeline.json');

describe('parsePipeline: the compare section (re-fit after flooring changes)', () => {
  it('reads a re-fit pipeline: paths relative to the pipeline and out.dir', () => {
    const p = parse(base);
    expect(p.compare).toEqual({ fdr: 0.05, nullDraws: 2 });
    expect(p.model).toBe('/data/p/old-model.json');
    expect(p.out.changes).toBe('/data/p/out/changes.csv');
    expect(p.out.model).toBe('/data/p/out/refit.json');
    expect(p.out.floor).toBe('/data/p/out/floor-after.json');
  });
  const bad: Array<[string, Record<string, unknown>, string]> = [
    ['an unknown compare key', { ...base, compare: { fdrr: 0.1 } }, '"compare" key must be one of "fdr", "minReadings", "nullDraws", "robust", "swapRounds", "seed", "transitions", "priorStrength", "maxIter", "tol", "workers", got "fdrr"'],
    ['compare without the old model', { ...base, model: undefined }, '"compare" must come with "model"'],
    ['compare together with fit', { ...base, fit: { restarts: 1 } }, 'must not both be given'],
    ['compare without out.changes', { ...base, out: { dir: 'out', model: 'refit.json' } }, '"out.changes" must name the changes table'],
    ['out.changes without compare', { ...base, compare: undefined, out: { dir: 'out', changes: 'c.csv', annotated: 'a.csv' } }, '"out.changes" is written by a "compare" section'],
    ['decoding after compare without out.model', { ...base, out: { dir: 'out', changes: 'c.csv', annotated: 'a.csv' } }, '"out.model" must name the re-fitted model'],
    ['out.model in a decode-only pipeline', { ...base, compare: undefined, out: { dir: 'out', model: 'm.json', annotated: 'a.csv' } }, '"out.model" is written by "fit" or "compare"'],
  ];
  for (const [what, doc, message] of bad) {
    it(`${what} is one clear error`, () => {
      expect(() => parse(doc)).toThrow(message);
    });
  }
});

describe('parsePipeline: odometry columns', () => {
  it('"columns" takes movedCol and headingCol (the --moved-col / --heading-col options)', () => {
    const p = parse({ ...base, columns: { movedCol: 'odo_m', headingCol: 'odo_deg' } });
    expect(p.columns).toEqual({ movedCol: 'odo_m', headingCol: 'odo_deg' });
  });
  it('an empty odometry column name is one clear error', () => {
    expect(() => parse({ ...base, columns: { movedCol: '' } })).toThrow('"columns.movedCol" must be a column name, got ""');
  });
});

describe('parsePipeline: a time column', () => {
  it('reads "timeCol" and "period" in "columns"', () => {
    const p = parse({ ...base, columns: { timeCol: 't', period: '100ms' } });
    expect(p.columns).toEqual({ timeCol: 't', period: '100ms' });
  });
  it('refuses a bad period, and a period without a time column', () => {
    expect(() => parse({ ...base, columns: { timeCol: 't', period: '5min' } })).toThrow('"columns.period" must be a duration > 0 in ms or s');
    expect(() => parse({ ...base, columns: { timeCol: 't', period: 100 } })).toThrow('"columns.period" must be a duration');
    expect(() => parse({ ...base, columns: { period: '1s' } })).toThrow('"columns.period" must come with "columns.timeCol"');
    expect(() => parse({ ...base, columns: { timeCol: '' } })).toThrow('"columns.timeCol" must be a column name');
  });
});
