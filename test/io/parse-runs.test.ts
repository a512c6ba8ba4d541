import {
  Float64,
  Int32,
  Int64,
  Table,
  tableToIPC,
  Utf8,
  vectorFromArray,
  type Vector,
} from 'apache-arrow';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { MAX_GAP_STEPS, MAX_TOTAL_STEPS, maxTotalSteps } from '../../src/io/build-runs-table.js';
import { runsFromArrow, runsFromCsv } from '../../src/io/parse-runs.js';
import { DROPOUT, type ReadRunsOptions } from '../../src/io/runs-table.js';

// Source for every rule checked here: the file formats (docs/formats.md), "Runs table" (columns, sorting, gaps
// as dropouts, duplicate steps and unknown readings as errors, --unknown-readings dropout, column
// options). Surfaces and runs are invented.

const SURFACES = ['oak', 'carpet', 'tile'];
const OPTIONS: ReadRunsOptions = { surfaces: SURFACES };
const [OAK, CARPET, TILE] = [0, 1, 2];

function csvError(text: string, options: ReadRunsOptions = OPTIONS): string {
  try {
    runsFromCsv(text, 'runs.csv', options);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    const message = (err as Error).message;
    expect(message).not.toMatch(/[\r\n]/);
    expect(message.startsWith('runs.csv: ')).toBe(true);
    return message;
  }
  throw new Error('expected an InputError');
}

function arrowBytes(columns: Record<string, Vector>, stream = false): Uint8Array {
  return tableToIPC(new Table(columns), stream ? 'stream' : 'file');
}

function arrowError(bytes: Uint8Array, options: ReadRunsOptions = OPTIONS): string {
  try {
    runsFromArrow(bytes, 'runs.arrow', options);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    const message = (err as Error).message;
    expect(message).not.toMatch(/[\r\n]/);
    expect(message.startsWith('runs.arrow: ')).toBe(true);
    return message;
  }
  throw new Error('expected an InputError');
}

describe('runsFromCsv(text, source, options)', () => {
  it('runsFromCsv(text) groups rows by run in order of first appearance and codes readings', () => {
    const table = runsFromCsv('run,step,reading\nr2,0,oak\nr1,0,tile\nr2,1,carpet\nr1,1,oak\n', 'runs.csv', OPTIONS);
    expect(table.runs.map((r) => r.id)).toEqual(['r2', 'r1']);
    expect([...table.runs[0].obs]).toEqual([OAK, CARPET]);
    expect([...table.runs[0].rows]).toEqual([0, 2]);
    expect([...table.runs[1].obs]).toEqual([TILE, OAK]);
    expect([...table.runs[1].rows]).toEqual([1, 3]);
    expect(table.nRows).toBe(4);
    expect([table.runCol, table.stepCol, table.readingCol]).toEqual(['run', 'step', 'reading']);
    expect(table.warnings).toEqual([]);
  });

  it('runsFromCsv(text) sorts each run by step and keeps the first step', () => {
    const table = runsFromCsv('run,step,reading\nr1,12,tile\nr1,10,oak\nr1,11,carpet\n', 'runs.csv', OPTIONS);
    const run = table.runs[0];
    expect(run.firstStep).toBe(10);
    expect([...run.obs]).toEqual([OAK, CARPET, TILE]);
    expect([...run.rows]).toEqual([1, 2, 0]);
  });

  it('runsFromCsv(text) turns gaps in step into dropouts with no input row', () => {
    const table = runsFromCsv('run,step,reading\nr1,3,oak\nr1,4,oak\nr1,7,tile\n', 'runs.csv', OPTIONS);
    const run = table.runs[0];
    expect(run.firstStep).toBe(3);
    expect([...run.obs]).toEqual([OAK, OAK, DROPOUT, DROPOUT, TILE]);
    expect([...run.rows]).toEqual([0, 1, -1, -1, 2]);
    expect(run.nGapSteps).toBe(2);
    expect(run.nDropouts).toBe(0);
  });

  it('runsFromCsv(text) turns empty and quoted-empty readings into counted dropouts', () => {
    const table = runsFromCsv('run,step,reading\nr1,0,oak\nr1,1,\nr1,2,""\nr1,3,tile\n', 'runs.csv', OPTIONS);
    const run = table.runs[0];
    expect([...run.obs]).toEqual([OAK, DROPOUT, DROPOUT, TILE]);
    expect([...run.rows]).toEqual([0, 1, 2, 3]);
    expect(run.nDropouts).toBe(2);
    expect(run.nGapSteps).toBe(0);
  });

  it('runsFromCsv(text) accepts whole-number steps written as 12.0 or +12', () => {
    const table = runsFromCsv('run,step,reading\nr1,12.0,oak\nr1,+13,tile\n', 'runs.csv', OPTIONS);
    expect(table.runs[0].firstStep).toBe(12);
    expect([...table.runs[0].obs]).toEqual([OAK, TILE]);
  });

  it('runsFromCsv(text) keeps every column for pass-through, as text with null for empty', () => {
    const table = runsFromCsv('time,run,step,reading,note\n0.5,r1,0,oak,"a, b"\n1.0,r1,1,tile,\n', 'runs.csv', OPTIONS);
    expect(table.columns.map((c) => [c.name, c.kind])).toEqual([
      ['time', 'utf8'],
      ['run', 'utf8'],
      ['step', 'utf8'],
      ['reading', 'utf8'],
      ['note', 'utf8'],
    ]);
    expect(table.columns[0].get(1)).toBe('1.0');
    expect(table.columns[4].get(0)).toBe('a, b');
    expect(table.columns[4].get(1)).toBeNull();
  });

  it('runsFromCsv(text) uses the column names given in the options', () => {
    const table = runsFromCsv('robot,t,label\nbot-3,0,carpet\n', 'runs.csv', {
      surfaces: SURFACES,
      runCol: 'robot',
      stepCol: 't',
      readingCol: 'label',
    });
    expect(table.runs[0].id).toBe('bot-3');
    expect([...table.runs[0].obs]).toEqual([CARPET]);
    expect([table.runCol, table.stepCol, table.readingCol]).toEqual(['robot', 't', 'label']);
  });

  it('runsFromCsv(text) with unknownReadings dropout counts unknown labels and warns once', () => {
    const table = runsFromCsv('run,step,reading\nr1,0,wood\nr1,1,oak\nr2,0,wood\nr2,1,slate\n', 'runs.csv', {
      surfaces: SURFACES,
      unknownReadings: 'dropout',
    });
    expect([...table.runs[0].obs]).toEqual([DROPOUT, OAK]);
    expect([...table.runs[1].obs]).toEqual([DROPOUT, DROPOUT]);
    expect(table.runs.map((r) => [r.nUnknown, r.nDropouts])).toEqual([
      [1, 0],
      [2, 0],
    ]);
    expect(table.warnings).toEqual([
      `runs.csv: 3 readings not among the floor's surfaces became dropouts: "wood" (2), "slate" (1)`,
    ]);
  });
});

describe('runsFromCsv(text, source, options) errors (one per case in the contract)', () => {
  it('runsFromCsv(text) rejects a table without a run column, listing the columns and --run-col', () => {
    expect(csvError('robot,step,reading\nr1,0,oak\n')).toBe(
      'runs.csv: the run column must be present, got no column "run" among "robot", "step", "reading" (name another with --run-col)',
    );
  });

  it('runsFromCsv(text) rejects a table without a step column, naming --step-col', () => {
    expect(csvError('run,t,reading\nr1,0,oak\n')).toBe(
      'runs.csv: the step column must be present, got no column "step" among "run", "t", "reading" (name another with --step-col)',
    );
  });

  it('runsFromCsv(text) rejects a table without the reading column named in the options, naming --reading-col', () => {
    expect(csvError('run,step,reading\nr1,0,oak\n', { surfaces: SURFACES, readingCol: 'surface' })).toBe(
      'runs.csv: the reading column must be present, got no column "surface" among "run", "step", "reading" (name another with --reading-col)',
    );
  });

  it('runsFromCsv(text) rejects one column named for two roles', () => {
    expect(csvError('run,step,reading\nr1,0,oak\n', { surfaces: SURFACES, stepCol: 'run' })).toBe(
      'runs.csv: the run and step columns must differ, got "run" for both',
    );
  });

  it('runsFromCsv(text) rejects a table with a header and no rows', () => {
    expect(csvError('run,step,reading\n')).toBe('runs.csv: table must have at least one row of readings, got none');
  });

  it('runsFromCsv(text) rejects an empty run id, naming the line', () => {
    expect(csvError('run,step,reading\nr1,0,oak\n,1,oak\n')).toBe('runs.csv: run at line 3 must be a run id, got an empty value');
  });

  it('runsFromCsv(text) rejects a step that is not a whole number, naming the run and line', () => {
    expect(csvError('run,step,reading\nr1,0,oak\nr1,1.5,oak\n')).toBe(
      'runs.csv: step of run "r1" at line 3 must be a whole number >= 0, got "1.5"',
    );
  });

  it('runsFromCsv(text) rejects a negative step', () => {
    expect(csvError('run,step,reading\nr4,-1,oak\n')).toBe(
      'runs.csv: step of run "r4" at line 2 must be a whole number >= 0, got "-1"',
    );
  });

  it('runsFromCsv(text) rejects an empty step', () => {
    expect(csvError('run,step,reading\nr4,,oak\n')).toBe(
      'runs.csv: step of run "r4" at line 2 must be a whole number >= 0, got an empty value',
    );
  });

  it('runsFromCsv(text) rejects a step that is not a number', () => {
    expect(csvError('run,step,reading\nr4,0x10,oak\n')).toBe(
      'runs.csv: step of run "r4" at line 2 must be a whole number >= 0, got "0x10"',
    );
  });

  it('runsFromCsv(text) rejects a step repeated within a run, naming the run, the step and both lines', () => {
    expect(csvError('run,step,reading\nr1,5,oak\nr2,5,oak\nr1,6,oak\nr1,5,tile\n')).toBe(
      'runs.csv: step 5 of run "r1" must appear once, got it twice (line 2 and line 5)',
    );
  });

  it('runsFromCsv(text) rejects a reading not in the surfaces, naming the run, the step and the label', () => {
    expect(csvError('run,step,reading\nr7,11,oak\nr7,12,wood\n')).toBe(
      `runs.csv: reading at run "r7" step 12 must be one of the floor's surfaces (oak, carpet, tile), got "wood"`,
    );
  });

  it('runsFromCsv(text) shortens a long list of surfaces in the unknown-reading message', () => {
    const surfaces = ['s1', 's2', 's3', 's4', 's5', 's6', 's7', 's8', 's9', 's10'];
    expect(csvError('run,step,reading\nr1,0,s11\n', { surfaces })).toBe(
      `runs.csv: reading at run "r1" step 0 must be one of the floor's surfaces (s1, s2, s3, s4, s5, s6, s7, s8 and 2 more), got "s11"`,
    );
  });

  it('runsFromCsv(text) rejects a gap too long to fill with dropouts', () => {
    const last = MAX_GAP_STEPS + 2;
    expect(csvError(`run,step,reading\nr1,0,oak\nr1,${last},oak\n`)).toBe(
      `runs.csv: run "r1" must miss at most ${MAX_GAP_STEPS} steps, got ${MAX_GAP_STEPS + 1} missing between step 0 and step ${last} (is the step column a sample index?)`,
    );
  });

  it('runsFromCsv(text) names the file line of a bad row after a quoted line break', () => {
    expect(csvError('run,step,reading,note\nr1,0,oak,"two\nlines"\nr1,x,oak,\n')).toBe(
      'runs.csv: step of run "r1" at line 4 must be a whole number >= 0, got "x"',
    );
  });
});

describe('runsFromArrow(bytes, source, options)', () => {
  it('runsFromArrow(bytes) reads Int32 steps and dictionary-encoded readings from an IPC file', () => {
    const bytes = arrowBytes({
      run: vectorFromArray(['a', 'a', 'b', 'a']),
      step: vectorFromArray([2, 0, 0, 1], new Int32()),
      reading: vectorFromArray(['tile', 'oak', null, 'carpet']),
    });
    const table = runsFromArrow(bytes, 'runs.arrow', OPTIONS);
    expect(table.runs.map((r) => r.id)).toEqual(['a', 'b']);
    expect([...table.runs[0].obs]).toEqual([OAK, CARPET, TILE]);
    expect([...table.runs[0].rows]).toEqual([1, 3, 0]);
    expect([...table.runs[1].obs]).toEqual([DROPOUT]);
    expect(table.runs[1].nDropouts).toBe(1);
    expect(table.columns.map((c) => [c.name, c.kind])).toEqual([
      ['run', 'utf8'],
      ['step', 'number'],
      ['reading', 'utf8'],
    ]);
    expect(table.columns[1].get(0)).toBe(2);
    expect(table.columns[2].get(2)).toBeNull();
  });

  it('runsFromArrow(bytes) reads an IPC stream the same as a file', () => {
    const columns = {
      run: vectorFromArray(['a', 'a'], new Utf8()),
      step: vectorFromArray([0, 3], new Int32()),
      reading: vectorFromArray(['oak', 'tile'], new Utf8()),
    };
    const fromFile = runsFromArrow(arrowBytes(columns), 'runs.arrow', OPTIONS);
    const fromStream = runsFromArrow(arrowBytes(columns, true), 'runs.arrows', OPTIONS);
    expect([...fromStream.runs[0].obs]).toEqual([...fromFile.runs[0].obs]);
    expect([...fromStream.runs[0].obs]).toEqual([OAK, DROPOUT, DROPOUT, TILE]);
    expect(fromStream.runs[0].nGapSteps).toBe(2);
  });

  it('runsFromArrow(bytes) accepts Int64 (bigint), whole Float64 and text steps', () => {
    const steps: Vector[] = [
      vectorFromArray([5n, 6n], new Int64()),
      vectorFromArray([5, 6], new Float64()),
      vectorFromArray(['5', '6'], new Utf8()),
    ];
    for (const step of steps) {
      const table = runsFromArrow(
        arrowBytes({ run: vectorFromArray(['a', 'a'], new Utf8()), step, reading: vectorFromArray(['oak', 'tile'], new Utf8()) }),
        'runs.arrow',
        OPTIONS,
      );
      expect(table.runs[0].firstStep).toBe(5);
      expect([...table.runs[0].obs]).toEqual([OAK, TILE]);
    }
  });

  it('runsFromArrow(bytes) keeps Int64 pass-through values as bigint with their Arrow type', () => {
    const table = runsFromArrow(
      arrowBytes({
        run: vectorFromArray(['a'], new Utf8()),
        step: vectorFromArray([0], new Int32()),
        reading: vectorFromArray(['oak'], new Utf8()),
        stamp: vectorFromArray([1_700_000_000_000_123n], new Int64()),
      }),
      'runs.arrow',
      OPTIONS,
    );
    expect(table.columns[3].get(0)).toBe(1_700_000_000_000_123n);
    expect(String(table.columns[3].arrowType)).toBe('Int64');
  });

  it('runsFromArrow(bytes) reads a table split into several record batches', () => {
    const part = (runs: string[], steps: number[], readings: Array<string | null>) =>
      new Table({
        run: vectorFromArray(runs, new Utf8()),
        step: vectorFromArray(steps, new Int32()),
        reading: vectorFromArray(readings, new Utf8()),
      }).batches[0];
    const table = new Table([part(['a', 'b'], [1, 0], ['tile', 'oak']), part(['a', 'b'], [0, 1], [null, 'carpet'])]);
    expect(table.batches).toHaveLength(2);
    const runs = runsFromArrow(tableToIPC(table, 'stream'), 'runs.arrows', OPTIONS);
    expect(runs.runs.map((r) => [r.id, [...r.obs], [...r.rows]])).toEqual([
      ['a', [DROPOUT, TILE], [2, 0]],
      ['b', [OAK, CARPET], [1, 3]],
    ]);
    expect(runs.columns[0].get(3)).toBe('b');
  });

  it('runsFromArrow(bytes) accepts numeric run ids as their text', () => {
    const table = runsFromArrow(
      arrowBytes({
        run: vectorFromArray([17, 17], new Int32()),
        step: vectorFromArray([0, 1], new Int32()),
        reading: vectorFromArray(['oak', 'oak'], new Utf8()),
      }),
      'runs.arrow',
      OPTIONS,
    );
    expect(table.runs[0].id).toBe('17');
  });
});

describe('runsFromArrow(bytes, source, options) errors', () => {
  const run = vectorFromArray(['a', 'a'], new Utf8());
  const reading = vectorFromArray(['oak', 'tile'], new Utf8());

  it('runsFromArrow(bytes) rejects a fractional step, naming the run and row', () => {
    const bytes = arrowBytes({ run, step: vectorFromArray([0, 1.5], new Float64()), reading });
    expect(arrowError(bytes)).toBe('runs.arrow: step of run "a" at row 2 must be a whole number >= 0, got 1.5');
  });

  it('runsFromArrow(bytes) rejects a null step', () => {
    const bytes = arrowBytes({ run, step: vectorFromArray([0, null], new Int32()), reading });
    expect(arrowError(bytes)).toBe('runs.arrow: step of run "a" at row 2 must be a whole number >= 0, got an empty value');
  });

  it('runsFromArrow(bytes) rejects a negative Int64 step', () => {
    const bytes = arrowBytes({ run, step: vectorFromArray([0n, -3n], new Int64()), reading });
    expect(arrowError(bytes)).toBe('runs.arrow: step of run "a" at row 2 must be a whole number >= 0, got -3');
  });

  it('runsFromArrow(bytes) rejects a null run id', () => {
    const bytes = arrowBytes({ run: vectorFromArray(['a', null], new Utf8()), step: vectorFromArray([0, 1], new Int32()), reading });
    expect(arrowError(bytes)).toBe('runs.arrow: run at row 2 must be a run id, got an empty value');
  });

  it('runsFromArrow(bytes) rejects a duplicate step', () => {
    const bytes = arrowBytes({ run, step: vectorFromArray([4, 4], new Int32()), reading });
    expect(arrowError(bytes)).toBe('runs.arrow: step 4 of run "a" must appear once, got it twice (row 1 and row 2)');
  });

  it('runsFromArrow(bytes) rejects a reading not in the surfaces', () => {
    const bytes = arrowBytes({ run, step: vectorFromArray([0, 1], new Int32()), reading: vectorFromArray(['oak', 'Wood'], new Utf8()) });
    expect(arrowError(bytes)).toBe(
      `runs.arrow: reading at run "a" step 1 must be one of the floor's surfaces (oak, carpet, tile), got "Wood"`,
    );
  });

  it('runsFromArrow(bytes) rejects a missing column, listing the columns present', () => {
    const bytes = arrowBytes({ run, t: vectorFromArray([0, 1], new Int32()), reading });
    expect(arrowError(bytes)).toBe(
      'runs.arrow: the step column must be present, got no column "step" among "run", "t", "reading" (name another with --step-col)',
    );
  });

  it('runsFromArrow(bytes) rejects a table with no rows', () => {
    const bytes = arrowBytes({
      run: vectorFromArray([], new Utf8()),
      step: vectorFromArray([], new Int32()),
      reading: vectorFromArray([], new Utf8()),
    });
    expect(arrowError(bytes)).toBe('runs.arrow: table must have at least one row of readings, got none');
  });

  it('runsFromArrow(bytes) rejects empty and unreadable bytes', () => {
    expect(arrowError(new Uint8Array(0))).toBe('runs.arrow: file must be Arrow IPC (file or stream), got an empty file');
    const text = new TextEncoder().encode('run,step,reading\nr1,0,oak\n');
    expect(arrowError(text)).toMatch(/^runs\.arrow: file must be Arrow IPC \(file or stream\), got unreadable data \(.+\)$/);
  });
});

describe('reading repairs (documented: surrounding spaces and letter case)', () => {
  it('runsFromCsv(text) maps " Oak " to "oak", spaces-only to a dropout, and reports every repair in one warning', () => {
    const t = runsFromCsv('run,step,reading\nr1,0, Oak \nr1,1,TILE\nr1,2,"   "\nr1,3,oak\n', 'runs.csv', { surfaces: ['oak', 'carpet', 'tile'] });
    expect(Array.from(t.runs[0].obs)).toEqual([0, 2, -1, 0]);
    expect(t.warnings).toHaveLength(1);
    expect(t.warnings[0]).toContain('3 readings were repaired');
    expect(t.warnings[0]).toContain('" Oak " → "oak"');
  });
  it('runsFromCsv(text) does not guess when letter case alone tells two surfaces apart', () => {
    expect(() => runsFromCsv('run,step,reading\nr1,0,TILE\n', 'runs.csv', { surfaces: ['tile', 'Tile'] })).toThrow(/got "TILE"/);
  });
});

describe('key columns read without a string per row (same results as reading each value)', () => {
  it('runsFromCsv(text) tells run ids apart by their text, quoted or not, with doubled quotes, alternating', () => {
    const t = runsFromCsv('run,step,reading\nr1,0,oak\n"r1",1,tile\n"r""x",0,oak\nr1,2,oak\n"r""x",1,carpet\nr,3,oak\nr11,0,tile\n', 'runs.csv', OPTIONS);
    expect(t.runs.map((r) => [r.id, [...r.obs]])).toEqual([
      ['r1', [OAK, TILE, OAK]],
      ['r"x', [OAK, CARPET]],
      ['r', [OAK]],
      ['r11', [TILE]],
    ]);
  });

  it('runsFromCsv(text) matches readings only when the whole field is a surface', () => {
    expect(csvError('run,step,reading\nr1,0,oak\nr1,1,oaks\n')).toContain('got "oaks"');
    expect(csvError('run,step,reading\nr1,0,oak\nr1,1,oa\n')).toContain('got "oa"');
    const t = runsFromCsv('run,step,reading\nr1,0,"oak"\nr1,1,oak\nr1,2,carpet\n', 'runs.csv', OPTIONS);
    expect([...t.runs[0].obs]).toEqual([OAK, OAK, CARPET]);
  });

  it('runsFromCsv(text) reads steps with leading zeros and up to 2^53 exactly', () => {
    const t = runsFromCsv('run,step,reading\nr1,007,oak\nr1,8,tile\nr2,9007199254740990,oak\nr2,9007199254740991,tile\n', 'runs.csv', OPTIONS);
    expect(t.runs[0].firstStep).toBe(7);
    expect([...t.runs[0].obs]).toEqual([OAK, TILE]);
    expect(t.runs[1].firstStep).toBe(9007199254740990);
    expect([...t.runs[1].obs]).toEqual([OAK, TILE]);
    expect(csvError('run,step,reading\nr1,9007199254740992,oak\n')).toContain('whole number');
  });

  it('steps beyond 32 bits after small ones keep every step exact (CSV and Arrow)', () => {
    const csv = runsFromCsv('run,step,reading\na,1,oak\na,0,tile\nb,4294967297,oak\nb,4294967296,carpet\na,2,carpet\n', 'runs.csv', OPTIONS);
    const arrow = runsFromArrow(
      arrowBytes({
        run: vectorFromArray(['a', 'a', 'b', 'b', 'a'], new Utf8()),
        step: vectorFromArray([1n, 0n, 4294967297n, 4294967296n, 2n], new Int64()),
        reading: vectorFromArray(['oak', 'tile', 'oak', 'carpet', 'carpet'], new Utf8()),
      }),
      'runs.arrow',
      OPTIONS,
    );
    for (const t of [csv, arrow]) {
      expect(t.runs.map((r) => [r.id, r.firstStep, [...r.obs], [...r.rows]])).toEqual([
        ['a', 0, [TILE, OAK, CARPET], [1, 0, 4]],
        ['b', 4294967296, [CARPET, OAK], [3, 2]],
      ]);
    }
  });

  it('runsFromArrow(bytes) reads Utf8 readings with nulls, repairs and surfaces outside ASCII', () => {
    const surfaces = ['béton', 'oak', 'pierre bleue'];
    const t = runsFromArrow(
      arrowBytes({
        run: vectorFromArray(['é1', 'é1', 'é1', 'é1', 'é1', 'x'], new Utf8()),
        step: vectorFromArray([0, 1, 2, 3, 4, 0], new Int32()),
        reading: vectorFromArray(['béton', null, ' Oak ', 'pierre bleue', 'béton', 'béton'], new Utf8()),
      }),
      'runs.arrow',
      { surfaces },
    );
    expect(t.runs.map((r) => [r.id, [...r.obs]])).toEqual([
      ['é1', [0, DROPOUT, 1, 2, 0]],
      ['x', [0]],
    ]);
    expect(t.warnings[0]).toContain('" Oak " → "oak"');
    const bad = arrowBytes({
      run: vectorFromArray(['a', 'a'], new Utf8()),
      step: vectorFromArray([0, 1], new Int32()),
      reading: vectorFromArray(['béton', 'béto'], new Utf8()),
    });
    expect(arrowError(bad, { surfaces })).toContain('got "béto"');
  });

  it('maxTotalSteps(rows) is 1000 steps per row + 10⁶, at most 10⁸', () => {
    expect(maxTotalSteps(0)).toBe(1_000_000);
    expect(maxTotalSteps(400)).toBe(1_400_000);
    expect(maxTotalSteps(10_000_000)).toBe(MAX_TOTAL_STEPS);
  });

  it('runsFromCsv(text) refuses runs spanning more steps in all than the rows allow, naming the run that crosses the limit', () => {
    // 200 runs of two rows each, 0 and 10⁷ − 1: each run alone misses fewer than MAX_GAP_STEPS steps.
    const lines = ['run,step,reading'];
    for (let r = 0; r < 200; r++) lines.push(`r${r},0,oak`, `r${r},9999999,tile`);
    expect(csvError(`${lines.join('\n')}\n`)).toBe(
      'runs.csv: runs must span at most 1400000 steps in all (1000 per row + 1000000, at most 100000000; gaps count), ' +
        'got 10000000 by run "r0" (steps 0 to 9999999 in 2 rows; is the step column a sample index?)',
    );
    // Within the limit: 4 rows may span 1 004 000 steps; the second run crosses it.
    const text = 'run,step,reading\na,0,oak\na,999999,oak\nb,5,tile\nb,4005,tile\n';
    expect(csvError(text)).toContain('got 1004001 by run "b" (steps 5 to 4005 in 2 rows;');
    expect(runsFromCsv('run,step,reading\na,0,oak\na,999999,oak\nb,5,tile\nb,4004,tile\n', 'runs.csv', OPTIONS).runs[1].nSteps).toBe(4000);
  });

  it('runsFromCsv(text) counts earlier tables\' rows and steps against the limit (prior)', () => {
    const text = 'run,step,reading\nb,0,tile\nb,9,tile\n';
    expect(runsFromCsv(text, 'runs.csv', { ...OPTIONS, prior: { rows: 2, steps: 1_003_990 } }).runs[0].nSteps).toBe(10);
    expect(csvError(text, { ...OPTIONS, prior: { rows: 2, steps: 1_003_991 } })).toContain('must span at most 1004000 steps in all');
  });

  it('runsFromCsv(text, { fillGaps: false }) keeps only the rows present and still counts the gaps', () => {
    const text = 'run,step,reading\nr1,3,oak\nr1,7,tile\nr1,4,\nr2,0,carpet\n';
    const filled = runsFromCsv(text, 'runs.csv', OPTIONS);
    const rowsOnly = runsFromCsv(text, 'runs.csv', { ...OPTIONS, fillGaps: false });
    expect([...rowsOnly.runs[0].obs]).toEqual([OAK, DROPOUT, TILE]);
    expect([...rowsOnly.runs[0].rows]).toEqual([0, 2, 1]);
    for (const [a, b] of filled.runs.map((run, r) => [run, rowsOnly.runs[r]] as const)) {
      expect(b.nSteps).toBe(a.obs.length);
      expect(a.nSteps).toBe(a.obs.length);
      expect([b.firstStep, b.nDropouts, b.nGapSteps, b.nUnknown]).toEqual([a.firstStep, a.nDropouts, a.nGapSteps, a.nUnknown]);
    }
    expect(rowsOnly.runs[0].nGapSteps).toBe(2);
  });
});
