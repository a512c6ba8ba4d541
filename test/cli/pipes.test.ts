import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync, createWriteStream } from 'node:fs';
import { tableFromIPC } from 'apache-arrow';
import { BIN, runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

// An invented 4 × 3 floor; tables passed through standard input and output, and a named pipe.
const floor = gridFloor(4, 3, ['oak', 'tile'], (x, y) => (x + y) % 2, 'pipes test floor');
const tmp = tempDir();
const p = tmp.path;

function cli(args: string[], input?: Buffer | string): { code: number | null; stdout: Buffer; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { input, env: { ...process.env, FORCE_COLOR: '0' }, timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr.toString('utf8') };
}

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  const r = runCli(['simulate', '--floor', p('floor.json'), '--runs', '3', '--steps', '40', '--seed', '2', '--out', p('runs.csv'), '-q']);
  expect(r.code, r.stderr).toBe(0);
  const f = runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--workers', '1', '-q']);
  expect(f.code, f.stderr).toBe(0);
});
afterAll(() => tmp.remove());

describe('standard input and output ("-") through the built command', () => {
  it('simulate --out - --format csv writes the table on stdout and its message on stderr', () => {
    const r = cli(['simulate', '--floor', p('floor.json'), '--runs', '2', '--steps', '5', '--out', '-', '--format', 'csv']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.toString('utf8').split('\n')[0]).toBe('run,step,reading,true_cell');
    expect(r.stdout.toString('utf8').trim().split('\n')).toHaveLength(11);
    expect(r.stderr).toContain('wrote -');
  });

  it('decode reads runs from stdin and writes Arrow to stdout, the same rows as from files', () => {
    const runs = readFileSync(p('runs.csv'));
    const r = cli(['decode', '--model', p('model.json'), '--runs', '-', '--format', 'csv', '--out', '-'], runs);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain('Decoded positions are statistical estimates'); // the safety note, on stderr
    // --format names both ends here: csv in, csv out
    expect(r.stdout.toString('utf8').split('\n')[0]).toMatch(/^run,step,reading,true_cell,path_cell,/);
    const a = cli(['decode', '--model', p('model.json'), '--runs', '-', '--format', 'arrows', '--out', p('from-stdin.csv'), '-q'],
      cli(['simulate', '--floor', p('floor.json'), '--runs', '3', '--steps', '40', '--seed', '2', '--out', '-', '--format', 'arrows', '-q']).stdout);
    expect(a.code, a.stderr).toBe(0);
    expect(a.stderr).toBe('');
    expect(a.stdout.length).toBe(0); // --quiet: nothing but errors
    const f = runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('from-file.csv'), '-q']);
    expect(f.code, f.stderr).toBe(0);
    expect(readFileSync(p('from-stdin.csv'), 'utf8')).toBe(readFileSync(p('from-file.csv'), 'utf8'));
    const arrow = cli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', '-', '--format', 'arrow', '-q']);
    expect(arrow.code, arrow.stderr).toBe(0);
    const table = tableFromIPC(arrow.stdout);
    expect(table.numRows).toBe(120);
    expect(table.schema.fields.map((f) => f.name)).toContain('path_cell');
  });

  it('a named pipe is read once, without hanging', async () => {
    execFileSync('mkfifo', [p('fifo.csv')]);
    const writer = createWriteStream(p('fifo.csv'));
    writer.end(readFileSync(p('runs.csv')));
    const child = spawn(process.execPath, [BIN, 'decode', '--model', p('model.json'), '--runs', p('fifo.csv'), '--out', p('from-fifo.csv'), '-q']);
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    const code = await new Promise<number | null>((resolve) => {
      const timer = setTimeout(() => child.kill(), 30_000);
      child.on('exit', (c) => {
        clearTimeout(timer);
        resolve(c);
      });
    });
    expect(code, stderr).toBe(0);
    expect(readFileSync(p('from-fifo.csv'), 'utf8')).toBe(readFileSync(p('from-file.csv'), 'utf8'));
  });

  it('bad uses of "-" are one line, exit 2; --json makes the error JSON', () => {
    const none = cli(['check', '--floor', p('floor.json'), '--runs', '-'], '');
    expect(none.code).toBe(2);
    expect(none.stderr.trim().split('\n')).toHaveLength(1);
    expect(none.stderr).toContain('must come with --format');
    const twice = cli(['check', '--floor', p('floor.json'), '--runs', '-', '-', '--format', 'csv'], readFileSync(p('runs.csv')));
    expect(twice.code).toBe(2);
    expect(twice.stderr).toContain('standard input must be named once');
    const both = cli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', '-', '--summary', '-', '--format', 'csv']);
    expect(both.code).toBe(2);
    expect(both.stderr).toContain('--summary must differ from every other output, got -');
    const badFormat = cli(['check', '--floor', p('floor.json'), '--runs', '-', '--format', 'xlsx'], '');
    expect(badFormat.stderr.trim()).toBe('underfoot: check: --format must be one of csv, arrow, feather, arrows, parquet, got "xlsx"');
    const json = cli(['check', '--floor', p('floor.json'), '--runs', '-', '--json'], '');
    expect(json.code).toBe(2);
    expect(JSON.parse(json.stderr)).toEqual({ error: '-: a table on standard input or output must come with --format (csv, arrow, feather, arrows, parquet), got no --format', exit: 2 });
  });
});
