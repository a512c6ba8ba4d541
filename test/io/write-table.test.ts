import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Int64, tableFromIPC, vectorFromArray } from 'apache-arrow';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError, WorkError } from '../../src/errors.js';
import type { OutputColumn, OutputTable } from '../../src/io/output-table.js';
import { runsFromArrow, runsFromCsv } from '../../src/io/parse-runs.js';
import { readRuns } from '../../src/io/read-runs.js';
import { DROPOUT } from '../../src/io/runs-table.js';
import { tableToArrowBytes } from '../../src/io/table-to-arrow-bytes.js';
import { tableToCsv } from '../../src/io/table-to-csv.js';
import { writeTable } from '../../src/io/write-table.js';

// Sources: RFC 4180, section 2, rules 6 and 7 (quote fields holding commas, quotes and line breaks;
// double a quote inside quotes); the file formats (docs/formats.md), "Runs table" (extensions) and "Files the tool
// writes" (atomic outputs). Float round trip: ECMAScript Number::toString gives the shortest text that
// reads back as the same double (ECMA-262, section 6.1.6.1.20), e.g. 0.1 + 0.2 -> "0.30000000000000004".

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'underfoot-write-table-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function column(name: string, kind: OutputColumn['kind'], values: Array<string | number | bigint | boolean | null>): OutputColumn {
  return { name, kind, get: (row) => values[row] };
}

/** A small annotated-looking table: two runs, one dropout row. */
function annotated(): OutputTable {
  return {
    nRows: 4,
    columns: [
      column('run', 'utf8', ['r1', 'r1', 'r1', 'r2, east']),
      column('step', 'int32', [0, 1, 2, 0]),
      column('reading', 'utf8', ['oak', null, 'tile', 'say "hi"\nbye']),
      column('path_p', 'float64', [0.1 + 0.2, 1 / 3, null, 1e-300]),
      column('note', 'utf8', ['', null, 'x', 'y']),
    ],
  };
}

const SURFACES = ['oak', 'tile', 'say "hi"\nbye'];

describe('tableToCsv(table)', () => {
  it('tableToCsv(table) quotes only when needed, writes null as an empty field and "" as a quoted empty field', () => {
    expect(tableToCsv(annotated())).toBe(
      'run,step,reading,path_p,note\n' +
        'r1,0,oak,0.30000000000000004,""\n' +
        'r1,1,,0.3333333333333333,\n' +
        'r1,2,tile,,x\n' +
        '"r2, east",0,"say ""hi""\nbye",1e-300,y\n',
    );
  });

  it('tableToCsv(table) writes only the header for zero rows', () => {
    expect(tableToCsv({ nRows: 0, columns: [column('a', 'utf8', []), column('b,c', 'float64', [])] })).toBe('a,"b,c"\n');
  });

  it('tableToCsv(table) rejects two columns with the same name', () => {
    const table = { nRows: 1, columns: [column('path_cell', 'utf8', ['a']), column('path_cell', 'utf8', ['b'])] };
    expect(() => tableToCsv(table)).toThrow(
      new InputError('output table: column 2 must have a unique name, got "path_cell" again (also column 1)'),
    );
  });

  it('tableToCsv(table) reads back through runsFromCsv with the same values', () => {
    const back = runsFromCsv(tableToCsv(annotated()), 'back.csv', { surfaces: SURFACES });
    const original = annotated();
    for (let j = 0; j < original.columns.length; j++) {
      for (let row = 0; row < original.nRows; row++) {
        const v = original.columns[j].get(row);
        expect(back.columns[j].get(row)).toBe(v === null ? null : String(v));
      }
    }
    expect(Number(back.columns[3].get(0))).toBe(0.1 + 0.2);
  });
});

describe('tableToArrowBytes(table, stream)', () => {
  it('tableToArrowBytes(table) stores utf8, float64 and int32 columns with nulls', () => {
    const arrow = tableFromIPC(tableToArrowBytes(annotated(), false));
    expect(arrow.schema.fields.map((f) => [f.name, String(f.type)])).toEqual([
      ['run', 'Utf8'],
      ['step', 'Int32'],
      ['reading', 'Utf8'],
      ['path_p', 'Float64'],
      ['note', 'Utf8'],
    ]);
    expect(arrow.numRows).toBe(4);
    expect(arrow.getChild('path_p')?.get(0)).toBe(0.1 + 0.2);
    expect(arrow.getChild('path_p')?.get(2)).toBeNull();
    expect(arrow.getChild('reading')?.get(1)).toBeNull();
    expect(arrow.getChild('note')?.get(0)).toBe('');
  });

  it('tableToArrowBytes(table) keeps a pass-through column\'s Arrow type, or infers one from the values', () => {
    const stamp = vectorFromArray([1_700_000_000_000_123n, null], new Int64());
    const table: OutputTable = {
      nRows: 2,
      columns: [
        { name: 'stamp', kind: 'passthrough', arrowType: stamp.type, get: (row) => stamp.get(row) as bigint | null },
        column('speed', 'passthrough', [0.25, null]),
        column('docked', 'passthrough', [true, false]),
        column('label', 'passthrough', ['x', 3]),
        column('empty', 'passthrough', [null, null]),
      ],
    };
    const arrow = tableFromIPC(tableToArrowBytes(table, true));
    expect(arrow.schema.fields.map((f) => String(f.type))).toEqual(['Int64', 'Float64', 'Bool', 'Utf8', 'Utf8']);
    expect(arrow.getChild('stamp')?.get(0)).toBe(1_700_000_000_000_123n);
    expect(arrow.getChild('label')?.get(1)).toBe('3');
  });

  it('tableToArrowBytes(table) rejects a non-number in a float64 column as a failure while working', () => {
    const table = { nRows: 1, columns: [column('path_p', 'float64', ['high'])] };
    expect(() => tableToArrowBytes(table, false)).toThrow(
      new WorkError('output table: column "path_p" row 1 must be a number, got "high"'),
    );
  });

  it('tableToArrowBytes(table) rejects a fractional value in an int32 column', () => {
    const table = { nRows: 1, columns: [column('steps', 'int32', [2.5])] };
    expect(() => tableToArrowBytes(table, false)).toThrow(
      new WorkError('output table: column "steps" row 1 must be a 32-bit integer, got 2.5'),
    );
  });
});

describe('writeTable(path, table)', () => {
  it('writeTable(path.arrow) then readRuns and runsFromArrow read the same runs (IPC file)', async () => {
    const path = join(dir, 'annotated.arrow');
    await writeTable(path, annotated());
    const viaPath = await readRuns(path, { surfaces: SURFACES });
    const viaBytes = runsFromArrow(await readFile(path), path, { surfaces: SURFACES });
    for (const table of [viaPath, viaBytes]) {
      expect(table.runs.map((r) => r.id)).toEqual(['r1', 'r2, east']);
      expect([...table.runs[0].obs]).toEqual([0, DROPOUT, 1]);
      expect([...table.runs[1].obs]).toEqual([2]);
      expect(table.columns[3].get(0)).toBe(0.1 + 0.2);
      expect(table.columns[4].get(1)).toBeNull();
    }
    expect(await readdir(dir)).not.toContainEqual(expect.stringContaining('.tmp-'));
  });

  it('writeTable(path.arrows) writes an IPC stream that reads back the same', async () => {
    const path = join(dir, 'annotated.arrows');
    await writeTable(path, annotated());
    const bytes = await readFile(path);
    // Source: Arrow columnar format, "IPC File Format": files begin with the magic "ARROW1"; streams do not.
    expect(new TextDecoder().decode(bytes.subarray(0, 6))).not.toBe('ARROW1');
    const table = await readRuns(path, { surfaces: SURFACES });
    expect([...table.runs[0].obs]).toEqual([0, DROPOUT, 1]);
  });

  it('writeTable(path.feather) writes an IPC file', async () => {
    const path = join(dir, 'annotated.feather');
    await writeTable(path, annotated());
    expect(new TextDecoder().decode((await readFile(path)).subarray(0, 6))).toBe('ARROW1');
  });

  it('writeTable(path.csv) writes the CSV text and reads back through readRuns', async () => {
    const path = join(dir, 'annotated.csv');
    await writeTable(path, annotated());
    expect(await readFile(path, 'utf8')).toBe(tableToCsv(annotated()));
    const table = await readRuns(path, { surfaces: SURFACES });
    expect([...table.runs[0].obs]).toEqual([0, DROPOUT, 1]);
    expect(table.columns[2].get(3)).toBe('say "hi"\nbye');
  });

  it('writeTable(path.csv) writes tables larger than one chunk completely', async () => {
    const n = 20_000;
    const path = join(dir, 'long.csv');
    await writeTable(path, { nRows: n, columns: [column('i', 'int32', Array.from({ length: n }, (_, i) => i))] });
    const lines = (await readFile(path, 'utf8')).split('\n');
    expect(lines.length).toBe(n + 2);
    expect(lines[n]).toBe(String(n - 1));
  });

  it('writeTable(path) rejects an unsupported extension and writes nothing', async () => {
    const path = join(dir, 'out.xlsx');
    await expect(writeTable(path, annotated())).rejects.toThrow(
      new InputError(`${path}: extension must be one of .csv, .arrow, .feather, .arrows, .parquet, got ".xlsx"`),
    );
    expect(await readdir(dir)).not.toContain('out.xlsx');
  });

  it('writeTable(path) keeps the old file when the table is bad', async () => {
    const path = join(dir, 'keep.csv');
    await writeFile(path, 'old\n');
    const bad = { nRows: 1, columns: [column('a', 'utf8', ['x']), column('a', 'utf8', ['y'])] };
    await expect(writeTable(path, bad)).rejects.toThrow(InputError);
    await expect(writeTable(join(dir, 'keep.arrow'), bad)).rejects.toThrow(InputError);
    expect(await readFile(path, 'utf8')).toBe('old\n');
    expect(await readdir(dir)).not.toContain('keep.arrow');
  });
});
