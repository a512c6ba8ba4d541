import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { reportConfig } from '../../src/cli/report-command.js';
import { formatModel } from '../../src/io/format-model.js';
import { tableToCsv } from '../../src/io/table-to-csv.js';
import { reportFixture } from '../report/report-fixture.js';

const tmp = tempDir('underfoot-report-');
const p = tmp.path;
const fixture = reportFixture();

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(fixture.floor));
  writeFileSync(p('model.json'), formatModel(fixture.modelFile));
  const a = fixture.annotated!;
  writeFileSync(p('annotated.csv'), tableToCsv({ nRows: a.nRows, columns: a.columns.map((c) => ({ name: c.name, kind: 'passthrough' as const, get: (row: number) => c.get(row) })) }));
  const rows = fixture.runRows!;
  writeFileSync(
    p('runs.csv'),
    `${['run,steps,dropouts,split,loglik_per_reading,mean_path_p,low_confidence_steps,surprising_steps']
      .concat(rows.map((r) => [r.run, r.steps, r.dropouts, r.split, r.loglikPerReading, r.meanPathP, r.lowConfidenceSteps, r.surprisingSteps].join(',')))
      .join('\n')}\n`,
  );
  writeFileSync(p('changes.csv'), 'cell,surface_before,surface_after,expected_readings,tv_distance,g_stat,p_value,q_value,verdict\nG-1-1,tile,oak,210,0.52,40,1e-7,1e-6,changed\n');
  // The runs the annotated table came from (its first three columns), for a decode-only pipeline.
  writeFileSync(p('raw-runs.csv'), readFileSync(p('annotated.csv'), 'utf8').split('\n').map((l) => l.split(',').slice(0, 3).join(',')).join('\n'));
});
afterAll(() => tmp.remove());

describe('reportConfig(opts)', () => {
  const base = { model: 'm.json', out: 'r.html', simRuns: '100', seed: '1', ambiguousBelow: '0.5', runCol: 'run', stepCol: 'step', readingCol: 'reading', unknownReadings: 'error' };
  it('turns flags into a config; the simulated run length is left to the runs unless given', () => {
    const c = reportConfig({ ...base, annotated: 'a.arrow' });
    expect(c).toMatchObject({ model: 'm.json', out: 'r.html', annotated: 'a.arrow', floor: null, summary: null, changes: null });
    expect(c.ambiguity).toEqual({ runs: 100, seed: 1, threshold: 0.5 });
    expect(reportConfig({ ...base, simSteps: '250' }).ambiguity.steps).toBe(250);
  });
  it('rejects bad numbers with one line naming the flag', () => {
    expect(() => reportConfig({ ...base, simRuns: '0' })).toThrow('report: --sim-runs must be a whole number from 1 to 100000, got "0"');
    expect(() => reportConfig({ ...base, ambiguousBelow: '1.5' })).toThrow('report: --ambiguous-below must be a probability in (0, 1], got "1.5"');
    expect(() => reportConfig({ ...base, simSteps: 'many' })).toThrow('report: --sim-steps must be a whole number from 1 to 1000000, got "many"');
  });
});

describe('underfoot report (built command)', () => {
  it('writes one HTML file from a model, floor, annotated table, run summary and changes table', () => {
    const r = runCli(['report', '--model', p('model.json'), '--floor', p('floor.json'), '--annotated', p('annotated.csv'), '--summary', p('runs.csv'), '--changes', p('changes.csv'), '--sim-runs', '20', '--out', p('out/report.html')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain(`wrote ${p('out/report.html')}`);
    expect(r.stdout).toContain('16 cells, 1 reads unlike the survey');
    expect(r.stdout).toMatch(/not a safety function/);
    const html = readFileSync(p('out/report.html'), 'utf8');
    for (const id of ['summary', 'floor-map', 'restarts', 'emissions', 'ambiguity', 'runs']) expect(html).toContain(`<section id="${id}"`);
    expect(html).toContain('id="ov-changes"');
    expect(html).toContain('20 runs of 120 steps were simulated'); // run length taken from the summary's runs
  });

  it('reports from a model alone, and prints JSON for scripts', () => {
    const r = runCli(['report', '--model', p('model.json'), '--sim-runs', '5', '--sim-steps', '40', '--json', '--out', p('alone.html')]);
    expect(r.code, r.stderr).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json).toMatchObject({ out: p('alone.html'), cells: 16, disagreements: ['G-1-1'], runs: null });
    expect(json.ambiguity.options).toMatchObject({ runs: 5, steps: 40, seed: 1 });
  });

  it('fails with one line and exit 2 on bad input, writing nothing', () => {
    const badOut = runCli(['report', '--model', p('model.json'), '--out', p('report.csv')]);
    expect(badOut.code).toBe(2);
    expect(badOut.stderr.trim()).toBe(`underfoot: ${p('report.csv')}: the report file name must end in .html, got "report.csv"`);
    writeFileSync(p('bad-changes.csv'), 'cell,verdict\nG-1-1,changed\nnowhere,changed\n');
    const badCell = runCli(['report', '--model', p('model.json'), '--changes', p('bad-changes.csv'), '--out', p('bad.html')]);
    expect(badCell.code).toBe(2);
    expect(badCell.stderr.trim()).toBe(`underfoot: ${p('bad-changes.csv')}: line 3 cell must be a cell of the model, got "nowhere"`);
    expect(existsSync(p('bad.html'))).toBe(false);
    const missing = runCli(['report', '--model', p('nope.json'), '--out', p('nope.html')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr.split('\n').filter(Boolean)).toHaveLength(1);
  });

  it('run writes the report last when the pipeline names out.report', () => {
    writeFileSync(p('pipe.json'), JSON.stringify({
      format: 'underfoot-pipeline/1', floor: 'floor.json', runs: ['raw-runs.csv'], model: 'model.json',
      out: { dir: 'piped', summary: 'runs.csv', report: 'report.html' },
    }));
    const r = runCli(['run', p('pipe.json')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain(p('piped/report.html'));
    const html = readFileSync(p('piped/report.html'), 'utf8');
    expect(html).toContain('runs from the run summary table');
    writeFileSync(p('pipe-bad.json'), JSON.stringify({ format: 'underfoot-pipeline/1', floor: 'floor.json', runs: ['raw-runs.csv'], model: 'model.json', out: { dir: 'x', report: 'report.txt' } }));
    const bad = runCli(['run', p('pipe-bad.json')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('"out.report" must end in .html, .htm, got "report.txt"');
  });
});
