import { describe, it, expect } from 'vitest';
import { changeRowsFromTable } from '../../src/report/change-rows-from-table.js';
import { columnsFromBytes } from '../../src/io/columns-from-bytes.js';

const read = (csv: string, cells = ['a', 'b', 'c']) => changeRowsFromTable(columnsFromBytes(new TextEncoder().encode(csv), 'csv', 'changes.csv'), cells);
const HEADER = 'cell,surface_before,surface_after,expected_readings,tv_distance,g_stat,p_value,q_value,verdict';

describe('changeRowsFromTable(table, cellIds)', () => {
  it('reads the columns compare writes; empty statistics are NaN', () => {
    const rows = read(`${HEADER}\na,oak,carpet,412.5,0.61,300.2,1e-9,3e-9,changed\nc,oak,oak,12,0.1,,,,too-few-readings`);
    expect(rows[0]).toEqual({ cell: 'a', verdict: 'changed', surfaceBefore: 'oak', surfaceAfter: 'carpet', expectedReadings: 412.5, tvDistance: 0.61, qValue: 3e-9, region: null, candidates: [], explanation: null });
    expect(rows[1].verdict).toBe('too-few-readings');
    expect(Number.isNaN(rows[1].qValue)).toBe(true);
  });

  it('reads the region, its candidates and the explanation when present', () => {
    const rows = read(`${HEADER},region,candidates,explanation\na,oak,carpet,412.5,0.61,300.2,1e-9,3e-9,changed,R1,a;b,"Reads carpet 62 % of the time, was oak 80 %: flagged."\nb,oak,oak,300,0.05,2,0.5,3e-9,changed,R1,a;b,x`);
    expect(rows[0]).toMatchObject({ region: 'R1', candidates: ['a', 'b'], explanation: 'Reads carpet 62 % of the time, was oak 80 %: flagged.' });
    expect(rows[1].candidates).toEqual(['a', 'b']);
  });

  it('needs only cell and verdict', () => {
    expect(read('cell,verdict\nb,unchanged')).toEqual([{ cell: 'b', verdict: 'unchanged', surfaceBefore: null, surfaceAfter: null, expectedReadings: NaN, tvDistance: NaN, qValue: NaN, region: null, candidates: [], explanation: null }]);
  });

  it('names the file and line of a cell the model lacks, a repeated cell, a bad verdict or a missing column', () => {
    expect(() => read('cell,verdict\nzz,changed')).toThrow('changes.csv: line 2 cell must be a cell of the model, got "zz"');
    expect(() => read('cell,verdict\na,changed\na,unchanged')).toThrow('changes.csv: line 3 cell must appear once, got "a" again');
    expect(() => read('cell,verdict\na,moved')).toThrow('changes.csv: line 2 verdict must be one of changed, unchanged, too-few-readings, got "moved"');
    expect(() => read('cell\na')).toThrow('changes.csv: the changes table must have a "verdict" column, got columns "cell"');
  });
});
