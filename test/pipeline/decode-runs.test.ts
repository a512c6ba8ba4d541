import { describe, it, expect } from 'vitest';
import { decodeRuns } from '../../src/pipeline/decode-runs.js';
import { runsFromArrow, runsFromCsv } from '../../src/io/parse-runs.js';
import { tableToArrowBytes } from '../../src/io/table-to-arrow-bytes.js';
import { tableToParquetBytes } from '../../src/io/table-to-parquet-bytes.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { DataType, Float32, Int16, Type, Uint32, makeVector, tableFromIPC, tableToIPC, Table, vectorFromArray, type Dictionary } from 'apache-arrow';
import { parquetMetadata } from 'hyparquet';

const floor = gridFloor(2, 1, ['oak', 'tile'], (x) => x);

describe('decodeRuns(model, tables)', () => {
  it('keeps steps beyond the 32-bit range (millisecond timestamps) exact in Arrow output', () => {
    const table = runsFromCsv('run,step,reading\nr1,1700000000000,oak\nr1,1700000000001,tile\n', 'runs.csv', { surfaces: floor.surfaces });
    const out = decodeRuns(buildModel(floor), [table], { lowConfidence: 0.5, surprisingBits: 6 }, () => 'unseen');
    const arrow = tableFromIPC(tableToArrowBytes(out.annotated, false));
    expect(Array.from(arrow.getChild('step')!.toArray() as BigInt64Array)).toEqual([1700000000000n, 1700000000001n]);
  });
  it('writes the step column as int64 whatever the input held (CSV text, Arrow int16, uint32, float32, steps from --time-col)', () => {
    const model = buildModel(floor);
    const th = { lowConfidence: 0.5, surprisingBits: 6 };
    const arrowRuns = (step: ReturnType<typeof makeVector>) =>
      runsFromArrow(
        tableToIPC(new Table({ run: vectorFromArray(['r1', 'r1', 'r1']), step, reading: vectorFromArray(['oak', 'tile', 'oak']) })),
        'runs.arrow',
        { surfaces: floor.surfaces },
      );
    const inputs = [
      runsFromCsv('run,step,reading\nr1,0,oak\nr1,1,tile\nr1,3,oak\n', 'runs.csv', { surfaces: floor.surfaces }),
      arrowRuns(makeVector({ type: new Int16(), data: Int16Array.of(0, 1, 3) })),
      arrowRuns(makeVector({ type: new Uint32(), data: Uint32Array.of(0, 1, 3) })),
      arrowRuns(makeVector({ type: new Float32(), data: Float32Array.of(0, 1, 3) })),
      runsFromCsv('run,t,reading\nr1,0.0,oak\nr1,0.1,tile\nr1,0.3,oak\n', 'runs.csv', { surfaces: floor.surfaces, timeCol: 't', period: 0.1 }),
    ];
    for (const table of inputs) {
      const arrow = tableFromIPC(tableToArrowBytes(decodeRuns(model, [table], th, () => 'unseen').annotated, false));
      const step = arrow.getChild('step')!;
      expect(step.type.typeId).toBe(Type.Int);
      expect(DataType.isInt(step.type) && step.type.bitWidth === 64 && step.type.isSigned).toBe(true);
      expect(Array.from(step.toArray() as BigInt64Array)).toEqual([0n, 1n, 3n]);
    }
  });
  it('stores id columns dictionary-encoded: cells over the model ids, run, reading, flag and zones over their values', () => {
    const model = buildModel(floor);
    const table = runsFromCsv('run,step,reading\nr1,0,oak\nr1,1,\nr2,0,tile\n', 'runs.csv', { surfaces: floor.surfaces });
    const out = decodeRuns(model, [table], { lowConfidence: 0.5, surprisingBits: 6 }, () => 'unseen');
    const arrow = tableFromIPC(tableToArrowBytes(out.annotated, false));
    for (const name of ['run', 'reading', 'path_cell', 'likely_cell', 'flag', 'path_zone', 'likely_zone']) {
      const type = arrow.getChild(name)!.type;
      expect(DataType.isDictionary(type), name).toBe(true);
      expect(DataType.isUtf8((type as Dictionary).dictionary), name).toBe(true);
      expect((type as Dictionary).indices.bitWidth, name).toBe(32);
    }
    // The cell dictionary is the model's cell ids in model order, whichever cells the path used.
    const pathCell = arrow.getChild('path_cell')!;
    expect(Array.from(pathCell.data[0].dictionary!.toArray() as string[])).toEqual(model.cells.map((c) => c.id));
    expect(pathCell.toArray().length).toBe(3);
    // Values read back as the text they stand for; the run dictionary holds each run once.
    expect([...arrow.getChild('run')!].map(String)).toEqual(['r1', 'r1', 'r2']);
    expect(Array.from(arrow.getChild('run')!.data[0].dictionary!.toArray() as string[])).toEqual(['r1', 'r2']);
    expect([...arrow.getChild('reading')!]).toEqual(['oak', null, 'tile']);
    expect([...arrow.getChild('flag')!][1]).toContain('dropout');
    // Parquet: the same columns in dictionary-encoded pages.
    const meta = parquetMetadata(tableToParquetBytes(out.annotated).buffer as ArrayBuffer);
    for (const chunk of meta.row_groups[0].columns) {
      const name = chunk.meta_data!.path_in_schema[0];
      if (['run', 'reading', 'path_cell', 'likely_cell', 'flag'].includes(name)) {
        expect(chunk.meta_data!.encodings, name).toContain('RLE_DICTIONARY');
      }
    }
  });
  it('writes probabilities within [0, 1] and entropies, surprises and spreads ≥ 0 (float overshoot clamped)', () => {
    // A floor whose cells all read alike: every posterior sums many equal terms, the case that overshoots.
    const flat = gridFloor(6, 4, ['oak', 'tile'], () => 0);
    const lines = ['run,step,reading'];
    for (let t = 0; t < 400; t++) lines.push(`r1,${t},${t % 7 === 0 ? 'tile' : 'oak'}`);
    const table = runsFromCsv(`${lines.join('\n')}\n`, 'runs.csv', { surfaces: flat.surfaces });
    const out = decodeRuns(buildModel(flat, { dwell: 0.9, hit: 0.8 }), [table], { lowConfidence: 0.5, surprisingBits: 6 }, () => 'fit');
    const col = (name: string) => out.annotated.columns.find((c) => c.name === name)!;
    for (const name of ['path_p', 'likely_p', 'entropy_bits', 'surprise_bits', 'spread_m']) {
      for (let row = 0; row < out.annotated.nRows; row++) {
        const v = col(name).get(row) as number | null;
        if (v === null) continue;
        expect(v, `${name} row ${row}`).toBeGreaterThanOrEqual(0);
        if (name.endsWith('_p')) expect(v, `${name} row ${row}`).toBeLessThanOrEqual(1);
      }
    }
  });
});

