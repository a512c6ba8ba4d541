import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { MAX_TABLE_COLUMNS, parseCsv, type CsvTable } from '../../src/io/parse-csv.js';

// Source for the examples: RFC 4180 "Common Format and MIME Type for Comma-Separated Values (CSV)
// Files", section 2, rules 1-7 and their examples (aaa,bbb,ccc / zzz,yyy,xxx). Line-end variants, the
// byte-order mark and trailing empty lines are this tool's own rules (task brief for src/io).

/** The columns as plain arrays. */
function values(csv: CsvTable): (string | null)[][] {
  return csv.columns.map((column) => column.toArray());
}

function expectCsvError(text: string, message: string): void {
  let caught: unknown;
  try {
    parseCsv(text, 'runs.csv');
  } catch (err) {
    caught = err;
  }
  expect(caught).toBeInstanceOf(InputError);
  expect((caught as Error).message).not.toMatch(/[\r\n]/);
  expect((caught as Error).message).toBe(message);
}

describe('parseCsv(text, source)', () => {
  it('parseCsv(text) reads records separated by CRLF with a header (RFC 4180 rules 1 and 3)', () => {
    const csv = parseCsv('field_name,field_name2,field_name3\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', 'x.csv');
    expect(csv.header).toEqual(['field_name', 'field_name2', 'field_name3']);
    expect(csv.nRows).toBe(2);
    expect(values(csv)).toEqual([
      ['aaa', 'zzz'],
      ['bbb', 'yyy'],
      ['ccc', 'xxx'],
    ]);
  });

  it('parseCsv(text) reads a last record without a line break (RFC 4180 rule 2)', () => {
    const csv = parseCsv('a,b,c\naaa,bbb,ccc\nzzz,yyy,xxx', 'x.csv');
    expect(values(csv)[2]).toEqual(['ccc', 'xxx']);
  });

  it('parseCsv(text) reads LF, CRLF and CR line ends alike, and mixed', () => {
    const expected = [
      ['1', '3', '5'],
      ['2', '4', '6'],
    ];
    for (const eol of ['\n', '\r\n', '\r']) {
      expect(values(parseCsv(['a,b', '1,2', '3,4', '5,6', ''].join(eol), 'x.csv'))).toEqual(expected);
    }
    expect(values(parseCsv('a,b\r\n1,2\n3,4\r5,6', 'x.csv'))).toEqual(expected);
  });

  it('parseCsv(text) drops a leading byte-order mark', () => {
    const csv = parseCsv('\ufeffrun,step\nr1,0\n', 'x.csv');
    expect(csv.header).toEqual(['run', 'step']);
  });

  it('parseCsv(text) reads quoted fields (RFC 4180 rule 5)', () => {
    const csv = parseCsv('a,b,c\n"aaa","bbb","ccc"\nzzz,yyy,xxx\n', 'x.csv');
    expect(values(csv)[0]).toEqual(['aaa', 'zzz']);
  });

  it('parseCsv(text) keeps commas and line breaks inside quotes (RFC 4180 rule 6)', () => {
    const csv = parseCsv('a,b,c\r\n"aaa","b\r\nbb","ccc"\r\nzzz,"y,y",xxx\r\n', 'x.csv');
    expect(values(csv)[1]).toEqual(['b\r\nbb', 'y,y']);
  });

  it('parseCsv(text) reads doubled quotes as one quote (RFC 4180 rule 7)', () => {
    const csv = parseCsv('a,b,c\n"aaa","b""bb","ccc"\n', 'x.csv');
    expect(values(csv)[1]).toEqual(['b"bb']);
    expect(values(parseCsv('a\n""""\n', 'x.csv'))[0]).toEqual(['"']);
  });

  it('parseCsv(text) gives null for an empty unquoted field and "" for a quoted empty field', () => {
    const csv = parseCsv('a,b,c\n,"",x\n1,,\n', 'x.csv');
    expect(values(csv)).toEqual([
      [null, '1'],
      ['', null],
      ['x', null],
    ]);
  });

  it('parseCsv(text) trims nothing: spaces stay part of the field', () => {
    const csv = parseCsv('a,b\n oak ,"tile "\n', 'x.csv');
    expect(values(csv)).toEqual([[' oak '], ['tile ']]);
  });

  it('parseCsv(text) ignores empty lines at the end but not a last quoted field that ends in a line break', () => {
    expect(parseCsv('a,b\n1,2\n\n\r\n\n', 'x.csv').nRows).toBe(1);
    const csv = parseCsv('a,b\n1,"two\n"\n\n', 'x.csv');
    expect(values(csv)[1]).toEqual(['two\n']);
  });

  it('parseCsv(text) reads a header with no data rows as zero rows', () => {
    const csv = parseCsv('run,step,reading\n', 'x.csv');
    expect(csv.nRows).toBe(0);
    expect(values(csv)).toEqual([[], [], []]);
  });

  it('parseCsv(text) reports the line each row starts on, counting line breaks inside quotes', () => {
    const csv = parseCsv('a,b\n1,"x\ny"\n2,z\r\n3,w', 'x.csv');
    expect([0, 1, 2].map((row) => csv.lineOfRow(row))).toEqual([2, 4, 5]);
  });

  it('parseCsv(text) keeps a stray quote inside an unquoted field as text', () => {
    expect(values(parseCsv('a\n5" tile\n', 'x.csv'))[0]).toEqual(['5" tile']);
  });

  it('parseCsv(text) handles many rows without per-row objects', () => {
    const n = 200_000;
    let text = 'run,step,reading\n';
    for (let i = 0; i < n; i++) text += `r${i % 7},${i},oak\n`;
    const csv = parseCsv(text, 'x.csv');
    expect(csv.nRows).toBe(n);
    expect(csv.columns[1].get(n - 1)).toBe(String(n - 1));
    expect(csv.lineOfRow(n - 1)).toBe(n + 1);
  });
});

describe('parseCsv(text, source) errors', () => {
  it('parseCsv(text) rejects an empty file', () => {
    expectCsvError('', 'runs.csv: file must have a header row, got an empty file');
    expectCsvError('\ufeff\r\n\n', 'runs.csv: file must have a header row, got an empty file');
  });

  it('parseCsv(text) rejects a row with too many fields, naming the line', () => {
    expectCsvError('run,step,reading\nr1,0,oak\nr1,1,oak,extra\n', 'runs.csv: line 3 must have 3 fields like the header, got 4');
  });

  it('parseCsv(text) rejects a row with too few fields, naming the line', () => {
    expectCsvError('run,step,reading\r\nr1,0,oak\r\nr1,1\r\n', 'runs.csv: line 3 must have 3 fields like the header, got 2');
  });

  it('parseCsv(text) rejects an empty line between rows', () => {
    expectCsvError('run,step\nr1,0\n\nr1,1\n', 'runs.csv: line 3 must have 2 fields like the header, got 1 (an empty line)');
  });

  it('parseCsv(text) rejects an empty header name', () => {
    expectCsvError('run,,reading\n', 'runs.csv: header column 2 must have a name, got an empty field');
  });

  it('parseCsv(text) rejects a repeated header name', () => {
    expectCsvError('run,step,run\n', 'runs.csv: header column 3 must have a unique name, got "run" again (also column 1)');
  });

  it('parseCsv(text) rejects a quote that is never closed, naming the line it opened on', () => {
    expectCsvError('a,b\n1,2\n3,"four\n5,6\n', 'runs.csv: line 3 field 2 must close its opening quote, got the end of the file');
  });

  it('parseCsv(text) rejects text after a closing quote', () => {
    expectCsvError('a,b\n1,"two"x\n', 'runs.csv: line 2 field 2 must end at its closing quote, got "x\\n" after it');
  });

  it(`parseCsv(text) reads a header of ${MAX_TABLE_COLUMNS} columns and refuses one more, while reading the header`, () => {
    const names = (k: number): string => Array.from({ length: k }, (_, j) => `c${j}`).join(',');
    const wide = parseCsv(`${names(MAX_TABLE_COLUMNS)}\n${'x,'.repeat(MAX_TABLE_COLUMNS - 1)}x\n`, 'runs.csv');
    expect(wide.header.length).toBe(MAX_TABLE_COLUMNS);
    expect(wide.nRows).toBe(1);
    expect(wide.columns[MAX_TABLE_COLUMNS - 1].get(0)).toBe('x');
    // No data row at all: the header alone is refused, before any storage for rows is made.
    expectCsvError(`${names(MAX_TABLE_COLUMNS + 5)}\n`, `runs.csv: header must name at most ${MAX_TABLE_COLUMNS} columns, got more (field ${MAX_TABLE_COLUMNS + 1} on line 1)`);
  });

  it('parseCsv(text) sizes row storage from the text: many columns and many line ends still read every row', () => {
    // 300 columns, then 5000 empty lines before the rows: the line ends alone would suggest 5003 rows.
    const header = Array.from({ length: 300 }, (_, j) => `c${j}`).join(',');
    const row = (v: string): string => Array.from({ length: 300 }, () => v).join(',');
    const csv = parseCsv(`${header}\n${row('1')}\n${row('2')}\r${row('3')}\r${row('4')}\n${'\n'.repeat(5000)}`, 'runs.csv');
    expect(csv.nRows).toBe(4);
    expect(csv.columns[299].toArray()).toEqual(['1', '2', '3', '4']);
    expect(csv.lineOfRow(3)).toBe(5);
  });
});

describe('parseCsv(bytes, source): the file read as bytes, without a text copy', () => {
  const bytesOf = (text: string): Uint8Array => new Uint8Array(Buffer.from(text, 'utf8'));

  it('parseCsv(bytes) reads the same fields as parseCsv(text), ASCII or not', () => {
    for (const text of ['a,b\n1,"x\ny"\n2,z\r\n3,w', 'run,reading\nr-ä,"tïle ""x"""\nr-ä,\n"日本",oak\r\n', '\ufeffrun,step\nr1,0\n']) {
      const fromBytes = parseCsv(bytesOf(text), 'x.csv');
      const fromText = parseCsv(text, 'x.csv');
      expect(fromBytes.header).toEqual(fromText.header);
      expect(values(fromBytes)).toEqual(values(fromText));
      expect(Array.from({ length: fromBytes.nRows }, (_, r) => fromBytes.lineOfRow(r))).toEqual(
        Array.from({ length: fromText.nRows }, (_, r) => fromText.lineOfRow(r)),
      );
    }
    expect(values(parseCsv(bytesOf('run,reading\nr-ä,"tïle ""x"""\n'), 'x.csv'))).toEqual([['r-ä'], ['tïle "x"']]);
  });

  it('parseCsv(bytes) refuses bytes that are not UTF-8: a stray byte, an overlong form, an encoded surrogate', () => {
    for (const bad of [[0x72, 0xff], [0xc0, 0xaf], [0xed, 0xa0, 0x80]]) {
      const bytes = new Uint8Array([...Buffer.from('run,step\nr', 'utf8'), ...bad, ...Buffer.from(',0\n', 'utf8')]);
      expect(() => parseCsv(bytes, 'runs.csv')).toThrow('runs.csv: file must be UTF-8 text, got bytes that are not valid UTF-8 on line 2');
    }
  });

  it('parseCsv(text) refuses text with a lone surrogate (it has no UTF-8 form), naming the line', () => {
    expectCsvError('run,step\nr1,0\nr\ud800,1\n', 'runs.csv: text must be well-formed Unicode, got a lone surrogate on line 3');
  });

  it('CsvColumn equals and digits compare the bytes in place', () => {
    const csv = parseCsv(bytesOf('run,step\nrä,0012\n"r""",123456789012345\n,1234567890123456\n'), 'x.csv');
    const [run, step] = csv.columns;
    expect([run.equals(0, 'rä'), run.equals(0, 'r'), run.equals(1, 'r"'), run.equals(2, '')]).toEqual([true, false, true, false]);
    expect([0, 1, 2].map((row) => step.digits(row))).toEqual([12, 123456789012345, -1]);
  });
});
