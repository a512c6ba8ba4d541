import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { tableToIPC, vectorFromArray, TimestampMicrosecond, Table, Utf8 } from 'apache-arrow';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { parseCsv } from '../../src/io/parse-csv.js';

// An invented 5 × 4 floor; runs simulated with step numbers, then rewritten with jittered clock times
// (as a robot's log has them) to check that --time-col gives the same steps, gaps and decoded paths.
const surfaces = ['oak', 'carpet', 'tile'];
const floor = gridFloor(5, 4, surfaces, (x, y) => (x + 2 * y) % 3, 'time column test floor');
const tmp = tempDir();
const p = tmp.path;
const START = Date.UTC(2026, 2, 1, 9, 30, 0) / 1000; // seconds since the epoch
const PERIOD = 0.1;

function ok(args: string[]): { stdout: string; stderr: string } {
  const r = runCli(args);
  expect(r.code, r.stderr).toBe(0);
  return r;
}

function fail(args: string[]): string {
  const r = runCli(args);
  expect(r.code).toBe(2);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  return lines[0];
}

/** Deterministic jitter in (−0.3, 0.3) periods, different at every step. */
const jitter = (k: number): number => 0.3 * Math.sin(12.9898 * k + 78.233);

interface Row { run: string; step: number; reading: string }
let rows: Row[] = [];

function isoOf(seconds: number): string {
  const ms = Math.floor(seconds * 1000);
  const micros = Math.round((seconds * 1000 - ms) * 1000);
  return new Date(ms).toISOString().replace('Z', `${String(micros).padStart(3, '0')}Z`);
}

function column(file: string, name: string): Array<string | null> {
  const t = parseCsv(readFileSync(file, 'utf8'), file);
  const c = t.columns[t.header.indexOf(name)];
  return Array.from({ length: t.nRows }, (_, r) => c.get(r));
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  ok(['simulate', '--floor', p('floor.json'), '--runs', '6', '--steps', '200', '--seed', '4', '--hit', '0.85', '--dropout-rate', '0.02', '--gap-rate', '0.03', '--out', p('steps.csv'), '-q']);
  const t = parseCsv(readFileSync(p('steps.csv'), 'utf8'), 'steps.csv');
  const get = (name: string) => t.columns[t.header.indexOf(name)];
  rows = Array.from({ length: t.nRows }, (_, r) => ({ run: get('run').get(r)!, step: Number(get('step').get(r)), reading: get('reading').get(r) ?? '' }));
  const timeOf = (row: Row, i: number) => START + 60 * Number(row.run.replace(/\D/g, '')) + (row.step + jitter(i)) * PERIOD;
  writeFileSync(p('iso.csv'), `${['run,t,reading', ...rows.map((row, i) => `${row.run},${isoOf(timeOf(row, i))},${row.reading}`)].join('\n')}\n`);
  writeFileSync(p('seconds.csv'), `${['run,t,reading', ...rows.map((row, i) => `${row.run},${timeOf(row, i).toFixed(6)},${row.reading}`)].join('\n')}\n`);
  const table = new Table({
    run: vectorFromArray(rows.map((row) => row.run), new Utf8()),
    t: vectorFromArray(rows.map((row, i) => new Date(timeOf(row, i) * 1000)), new TimestampMicrosecond()),
    reading: vectorFromArray(rows.map((row) => row.reading || null), new Utf8()),
  });
  writeFileSync(p('stamped.arrow'), tableToIPC(table, 'file'));
  ok(['fit', '--floor', p('floor.json'), '--runs', p('steps.csv'), '--out', p('model.json'), '--restarts', '1', '--workers', '1', '-q']);
  ok(['decode', '--model', p('model.json'), '--runs', p('steps.csv'), '--out', p('by-step.csv'), '-q']);
});
afterAll(() => tmp.remove());

describe('--time-col and --period through the built command', () => {
  it('ISO 8601 times with jitter give the same steps (from each run\'s first reading), gaps and paths as the step numbers', () => {
    const before = readFileSync(p('iso.csv'));
    const r = ok(['decode', '--model', p('model.json'), '--runs', p('iso.csv'), '--time-col', 't', '--period', '100ms', '--out', p('by-time.csv'), '--summary', p('by-time-summary.csv'), '-q']);
    expect(readFileSync(p('iso.csv')).equals(before)).toBe(true);
    expect(r.stderr).not.toContain('inferred');
    const firstStep = new Map<string, number>();
    for (const row of rows) if (!firstStep.has(row.run)) firstStep.set(row.run, row.step);
    const steps = column(p('by-time.csv'), 'step').map(Number);
    expect(steps).toEqual(rows.map((row) => row.step - firstStep.get(row.run)!));
    expect(column(p('by-time.csv'), 'path_cell')).toEqual(column(p('by-step.csv'), 'path_cell'));
    // gap_steps agree with the gaps in the step numbers
    ok(['decode', '--model', p('model.json'), '--runs', p('steps.csv'), '--out', p('by-step2.csv'), '--summary', p('by-step-summary.csv'), '-q']);
    expect(column(p('by-time-summary.csv'), 'gap_steps')).toEqual(column(p('by-step-summary.csv'), 'gap_steps'));
    expect(column(p('by-time-summary.csv'), 'gap_steps').some((g) => Number(g) > 0)).toBe(true);
  });

  it('without --period the period is inferred from the times and printed', () => {
    const r = ok(['check', '--floor', p('floor.json'), '--runs', p('seconds.csv'), '--time-col', 't']);
    expect(r.stdout + r.stderr).toMatch(/period 100 ms inferred/);
  });

  it('an Arrow timestamp column (microseconds) is read as times', () => {
    ok(['decode', '--model', p('model.json'), '--runs', p('stamped.arrow'), '--time-col', 't', '--out', p('arrow-time.csv'), '-q']);
    expect(column(p('arrow-time.csv'), 'path_cell')).toEqual(column(p('by-step.csv'), 'path_cell'));
  });

  it('an Arrow timestamp used as the step column is refused in one line', () => {
    const line = fail(['check', '--floor', p('floor.json'), '--runs', p('stamped.arrow'), '--step-col', 't']);
    expect(line).toContain('must hold step numbers, got an Arrow timestamp column (use --time-col t');
  });

  it('two readings on one step are an error naming the run and both times', () => {
    const line = fail(['check', '--floor', p('floor.json'), '--runs', p('iso.csv'), '--time-col', 't', '--period', '300ms']);
    expect(line).toMatch(/readings of run "sim-\d+" must fall on different steps of period 300 ms, got times 2026-03-01T\S+ \(line \d+\) and 2026-03-01T\S+ \(line \d+\)/);
  });

  it('a too short period warns that most steps are gaps', () => {
    const r = ok(['check', '--floor', p('floor.json'), '--runs', p('iso.csv'), '--time-col', 't', '--period', '10ms']);
    expect(r.stdout + r.stderr).toMatch(/steps \(\d+\.\d %\) are missing from the table and count as dropouts \(period 10 ms; is it right\?\)/);
  });

  it('bad options and bad times are one line, exit 2', () => {
    expect(fail(['check', '--floor', p('floor.json'), '--runs', p('iso.csv'), '--time-col', 't', '--period', '5min'])).toContain('--period must be a duration > 0 in ms or s');
    expect(fail(['check', '--floor', p('floor.json'), '--runs', p('iso.csv'), '--period', '100ms'])).toContain('--period must come with --time-col');
    expect(fail(['check', '--floor', p('floor.json'), '--runs', p('iso.csv'), '--time-col', 'when'])).toContain('no column "when"');
    writeFileSync(p('bad-time.csv'), 'run,t,reading\na,2026-03-01T09:30:00Z,oak\na,yesterday,oak\n');
    expect(fail(['check', '--floor', p('floor.json'), '--runs', p('bad-time.csv'), '--time-col', 't'])).toContain('time of run "a" at line 3 must be a time');
    writeFileSync(p('one-each.csv'), 'run,t,reading\na,1.5,oak\nb,2.5,oak\n');
    expect(fail(['check', '--floor', p('floor.json'), '--runs', p('one-each.csv'), '--time-col', 't'])).toContain('the period must be given with --period');
  });

  it('decode refuses to overwrite an existing step column with the mapped steps', () => {
    writeFileSync(p('both.csv'), `${['run,step,t,reading', ...rows.slice(0, 50).map((row, i) => `${row.run},${row.step},${(i * PERIOD).toFixed(3)},${row.reading}`)].join('\n')}\n`);
    const line = fail(['decode', '--model', p('model.json'), '--runs', p('both.csv'), '--time-col', 't', '--out', p('both-out.csv'), '-q']);
    expect(line).toContain('got "step" already in the runs table (name another with --step-col)');
    ok(['decode', '--model', p('model.json'), '--runs', p('both.csv'), '--time-col', 't', '--step-col', 'tick', '--out', p('both-out.csv'), '-q']);
    expect(column(p('both-out.csv'), 'tick').slice(0, 3)).toEqual(['0', '1', '2']);
  });
});
