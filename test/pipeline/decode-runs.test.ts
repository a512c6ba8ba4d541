import { describe, it, expect } from 'vitest';
import { decodeRuns } from '../../src/pipeline/decode-runs.js';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { tableToArrowBytes } from '../../src/io/table-to-arrow-bytes.js';
import { buildModel } from '../../src/model/build-model.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { tableFromIPC } from 'apache-arrow';

const floor = gridFloor(2, 1, ['oak', 'tile'], (x) => x);

describe('decodeRuns(model, tables)', () => {
  it('keeps steps beyond the 32-bit range (millisecond timestamps) exact in Arrow output', () => {
    const table = runsFromCsv('run,step,reading\nr1,1700000000000,oak\nr1,1700000000001,tile\n', 'runs.csv', { surfaces: floor.surfaces });
    const out = decodeRuns(buildModel(floor), [table], { lowConfidence: 0.5, surprisingBits: 6 }, () => 'unseen');
    const arrow = tableFromIPC(tableToArrowBytes(out.annotated, false));
    expect(Array.from(arrow.getChild('step')!.toArray() as Float64Array)).toEqual([1700000000000, 1700000000001]);
  });
  it('stores small steps as 32-bit integers', () => {
    const table = runsFromCsv('run,step,reading\nr1,0,oak\nr1,1,tile\n', 'runs.csv', { surfaces: floor.surfaces });
    const out = decodeRuns(buildModel(floor), [table], { lowConfidence: 0.5, surprisingBits: 6 }, () => 'unseen');
    expect(out.annotated.columns.find((c) => c.name === 'step')!.kind).toBe('int32');
  });
  it('writes probabilities within [0, 1] and entropies, surprises and spreads ≥ 0 (float overshoot clamped)', () => {
    // A floor whose cells all read alike: every posterior sums many equal terms, the case that overshoots.
    const flat = gridFloor(6, 4, ['oak', 'tile'], () => 0);
    const lines = ['run,step,reading'];
    for (let t = 0; t < 400; t++) lines.push(`r1,${t},${t % 7 === 0 ? 'tile' : 'oak'}`);
    const table = runsFromCsv(lines.join('\n') + '\n', 'runs.csv', { surfaces: flat.surfaces });
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

