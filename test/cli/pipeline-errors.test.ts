import { describe, it, expect, afterAll } from 'vitest';
import { existsSync, readdirSync, writeFileSync, mkdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { runCli, tempDir } from '../helpers/run-cli.js';

const demoFloor = fileURLToPath(new URL('../../datasets/quillmoor/floor.json', import.meta.url));
const tmp = tempDir();
afterAll(() => tmp.remove());

function pipeline(name: string, body: Record<string, unknown>): string {
  const file = tmp.path(name);
  writeFileSync(
    file,
    JSON.stringify({
      format: 'underfoot-pipeline/1',
      floor: demoFloor,
      runs: ['runs.csv'],
      fit: { restarts: 1, maxIter: 2 },
      out: { dir: `out-${name}`, model: 'model.json', annotated: 'annotated.csv', summary: 'runs.csv' },
      ...body,
    }),
  );
  return file;
}

function expectOneLineExit2(r: { code: number | null; stderr: string; stdout: string }, ...parts: string[]): void {
  expect(r.code).toBe(2);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, r.stderr).toHaveLength(1);
  for (const part of parts) expect(lines[0]).toContain(part);
  expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/); // no stack trace
}

describe('run PIPELINE.json with a bad pipeline', () => {
  it('an unknown key is one clear line, exit 2, and no output is written', () => {
    const file = pipeline('typo.json', { fit: { restarts: 1, maxIterations: 2 } });
    const r = runCli(['run', file]);
    expectOneLineExit2(r, 'typo.json', '"maxIterations"', 'must be one of');
    expect(existsSync(tmp.path('out-typo.json'))).toBe(false);
  });

  it('a missing runs file is one clear line naming it, exit 2, and no output is written', () => {
    const file = pipeline('missing.json', { runs: ['nowhere.csv'] });
    const r = runCli(['run', file]);
    expectOneLineExit2(r, 'nowhere.csv');
    expect(existsSync(tmp.path('out-missing.json'))).toBe(false);
  });

  it('a bad option value is one clear line naming the option', () => {
    const file = pipeline('badvalue.json', { fit: { restarts: 0 } });
    expectOneLineExit2(runCli(['run', file]), '"fit.restarts"', 'whole number');
  });

  it('a pipeline that is not JSON says where', () => {
    const file = tmp.path('broken.json');
    writeFileSync(file, '{ "format": "underfoot-pipeline/1",\n  "floor": }');
    expectOneLineExit2(runCli(['run', file]), 'broken.json', 'line 2');
  });

  it('a run whose readings the model cannot produce fails without leaving a half-written output', () => {
    const dir = tmp.path('fail');
    mkdirSync(dir);
    writeFileSync(tmp.path('fail/runs.csv'), 'run,step,reading\nr1,0,oak\nr1,1,carpet\n');
    const file = pipeline('fail/p.json', { fit: { restarts: 1, maxIter: 3, priorStrength: 0, hit: 1, holdout: 0 } });
    const r = runCli(['run', file]);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('r1');
    const out = tmp.path('fail/out-fail/p.json');
    if (existsSync(out)) expect(readdirSync(out).filter((f) => f.includes('.tmp-'))).toEqual([]);
  });
});

describe('bad command lines', () => {
  it('an unknown option exits 2 with a usage hint', () => {
    const r = runCli(['fit', '--floor', demoFloor, '--runs', 'x.csv', '--out', 'm.json', '--restart', '3']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("unknown option '--restart'");
  });

  it('a bad number is one line naming the flag', () => {
    expectOneLineExit2(runCli(['fit', '--floor', demoFloor, '--runs', 'x.csv', '--out', tmp.path('m.json'), '--hit', '1.5']), '--hit', '(0, 1]', '"1.5"');
  });
});
