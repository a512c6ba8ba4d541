import { describe, it, expect } from 'vitest';
import { runRowsFromTable } from '../../src/report/run-rows-from-table.js';
import { columnsFromBytes } from '../../src/io/columns-from-bytes.js';
import { tableToArrowBytes } from '../../src/io/table-to-arrow-bytes.js';
import type { OutputTable } from '../../src/io/output-table.js';

const utf8 = (text: string): Uint8Array => new TextEncoder().encode(text);

const SUMMARY_CSV = [
  'run,steps,dropouts,split,loglik,loglik_per_reading,path_logprob,mean_path_p,low_confidence_steps,surprising_steps',
  'dock-a,100,4,fit,-90,-0.9375,-140,0.42,60,2',
  '"<img src=x onerror=alert(1)>",50,0,held-out,,,,,0,0',
].join('\n');

describe('runRowsFromTable(columnsFromBytes(bytes, format, source))', () => {
  it('reads a run summary from CSV, an impossible run (empty log-likelihood) as NaN', () => {
    const rows = runRowsFromTable(columnsFromBytes(utf8(SUMMARY_CSV), 'csv', 'runs.csv'));
    expect(rows).toHaveLength(2);
    expect(rows[0]).toEqual({ run: 'dock-a', split: 'fit', steps: 100, dropouts: 4, loglikPerReading: -0.9375, meanPathP: 0.42, lowConfidenceSteps: 60, surprisingSteps: 2 });
    expect(rows[1].run).toBe('<img src=x onerror=alert(1)>');
    expect(Number.isNaN(rows[1].loglikPerReading)).toBe(true);
  });

  it('reads the same figures from an Arrow IPC file and stream', () => {
    const table: OutputTable = {
      nRows: 1,
      columns: [
        { name: 'run', kind: 'utf8', get: () => 'dock-a' },
        { name: 'steps', kind: 'int32', get: () => 100 },
        { name: 'loglik_per_reading', kind: 'float64', get: () => -0.9375 },
        { name: 'low_confidence_steps', kind: 'int32', get: () => 60 },
        { name: 'surprising_steps', kind: 'int32', get: () => 2 },
      ],
    };
    for (const stream of [false, true]) {
      const rows = runRowsFromTable(columnsFromBytes(tableToArrowBytes(table, stream), stream ? 'arrow-stream' : 'arrow-file', 'runs.arrow'));
      expect(rows).toEqual([{ run: 'dock-a', split: '', steps: 100, dropouts: 0, loglikPerReading: -0.9375, meanPathP: NaN, lowConfidenceSteps: 60, surprisingSteps: 2 }]);
    }
  });

  it('names the file, the line and the column of bad input', () => {
    const read = (csv: string) => runRowsFromTable(columnsFromBytes(utf8(csv), 'csv', 'runs.csv'));
    expect(() => read('run,steps\nx,1')).toThrow('runs.csv: the run summary table must have a "loglik_per_reading" column, got columns "run, steps"');
    expect(() => read('run,steps,loglik_per_reading,low_confidence_steps,surprising_steps\nx,1.5,-1,0,0')).toThrow('runs.csv: line 2 steps must be a whole number ≥ 0, got "1.5"');
    expect(() => read('run,steps,loglik_per_reading,low_confidence_steps,surprising_steps\nx,1,low,0,0')).toThrow('runs.csv: line 2 loglik_per_reading must be a number, got "low"');
    expect(() => columnsFromBytes(utf8('not arrow'), 'arrow-file', 'runs.arrow')).toThrow(/^runs\.arrow: file must be an Arrow IPC table/);
  });
});
