import { describe, it, expect } from 'vitest';
import { fileURLToPath } from 'node:url';
import { runCli } from '../helpers/run-cli.js';

const floor = fileURLToPath(new URL('../../datasets/quillmoor/floor.json', import.meta.url));
const runs = fileURLToPath(new URL('../../datasets/quillmoor/runs.csv', import.meta.url));

/** Layout only: numbers become #, absolute paths their base name. */
function layout(text: string): string {
  return text.replace(/\/[^\s)]*\/([^/\s)]+)/g, '$1').replace(/-?\d+(\.\d+)?(e-?\d+)?/g, '#');
}

describe('check', () => {
  it('check --floor --runs prints a summary a person can read (layout snapshot)', () => {
    const r = runCli(['check', '--floor', floor, '--runs', runs]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.split('\n').length).toBeLessThan(30);
    expect(r.stdout).toContain('250 cells');
    expect(layout(r.stdout)).toMatchSnapshot();
  });

  it('check --json gives the figures to scripts', () => {
    const r = runCli(['check', '--floor', floor, '--runs', runs, '--json']);
    const report = JSON.parse(r.stdout);
    expect(report.floor.nCells).toBe(250);
    expect(report.floor.levels).toEqual([0, 1]);
    expect(report.runs.runs).toBe(60);
    expect(report.floor.zones).toHaveLength(20);
    expect(report.floor.zones[0]).toEqual({ zone: 'Gallery', cells: 24, parts: 1 });
    expect(report.floor.unzonedCells).toBe(0);
  });
});

describe('--help', () => {
  for (const cmd of ['', 'check', 'simulate', 'fit', 'decode', 'run', 'compare', 'report', 'worker']) {
    it(`underfoot ${cmd || '(no command)'} --help is readable (snapshot)`, () => {
      const r = runCli(cmd ? [cmd, '--help'] : ['--help']);
      expect(r.code).toBe(0);
      for (const line of r.stdout.split('\n')) expect(line.length).toBeLessThanOrEqual(100);
      expect(r.stdout).toMatchSnapshot();
    });
  }
});
