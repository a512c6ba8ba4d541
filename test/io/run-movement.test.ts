import { describe, it, expect } from 'vitest';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { runMovement } from '../../src/io/run-movement.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';

const surfaces = ['oak', 'tile'];
const table = (csv: string) => runsFromCsv(csv, 'runs.csv', { surfaces });

describe('runMovement: odometry columns of a runs table', () => {
  it('reads distances and headings per step; empty = unknown; the first row is not used', () => {
    const t = table('run,step,reading,moved,heading\na,0,oak,0.4,10\na,1,tile,1.0,90\na,2,,0.05,\na,3,oak,,359.9\n');
    const m = runMovement(t);
    expect(m.movedCol).toBe('moved');
    expect(m.headingCol).toBe('heading');
    const od = m.runs![0];
    expect(Array.from(od.moved)).toEqual([NaN, 1, 0.05, NaN]);
    expect(Array.from(od.heading)).toEqual([NaN, 90, NaN, 359.9]);
    const bins = moveStepsFromOdometry(od.moved, od.heading);
    expect(Array.from(bins.dBin)).toEqual([-1, 100, 5, -1]);
    expect(Array.from(bins.hBin)).toEqual([-1, 18, -1, 71]);
  });

  it('a row after missing steps spreads its distance evenly over the transitions since the previous row, with its heading', () => {
    const t = table('run,step,reading,moved,heading\na,0,oak,0,\na,1,oak,0.5,0\na,4,tile,3,180\n');
    const od = runMovement(t).runs![0];
    expect(Array.from(od.moved)).toEqual([NaN, 0.5, 1, 1, 1]);
    expect(Array.from(od.heading)).toEqual([NaN, 0, 180, 180, 180]);
  });

  it('no odometry columns: nothing (the fit and decoding stay exactly as without odometry)', () => {
    expect(runMovement(table('run,step,reading\na,0,oak\n')).runs).toBeNull();
  });

  it('renamed columns; only one of the two present', () => {
    const m = runMovement(table('run,step,reading,odo\na,0,oak,0\na,1,oak,0.25\n'), { movedCol: 'odo' });
    expect(m.headingCol).toBeNull();
    expect(Array.from(m.runs![0].moved)).toEqual([NaN, 0.25]);
    expect(Array.from(m.runs![0].heading)).toEqual([NaN, NaN]);
  });
});
