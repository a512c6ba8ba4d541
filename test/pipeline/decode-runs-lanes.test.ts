import { describe, it, expect } from 'vitest';
import { decodeRuns } from '../../src/pipeline/decode-runs.js';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { buildModel } from '../../src/model/build-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { logChain } from '../../src/decode/log-chain.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { positionLayout } from '../../src/decode/position-layout.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';

// Oracle: `decodeRun` on each run alone, the one-run decoder `decode` used before runs were decoded in
// lane groups. The pipeline now groups runs by length; every annotated cell and every summary row must
// be what the one-run decoder gives, bit for bit, in input order. Floor and runs are invented.

describe('decodeRuns decodes in lane groups with the one-run numbers', () => {
  it('21 interleaved runs of different lengths, with gaps and dropouts, over two tables, on a floor with zones', () => {
    const floor = gridFloor(4, 3, ['oak', 'tile', 'carpet'], (x, y) => (x + 2 * y) % 3);
    floor.cells.forEach((c, i) => {
      if (i % 3 !== 0) c.zone = i < 6 ? 'east' : 'west';
    });
    const model = buildModel(floor, { dwell: 0.6, hit: 0.8 });
    const rng = new SeededRandom(31);
    const makeCsv = (first: number, count: number): string => {
      const rows: string[] = [];
      for (let r = first; r < first + count; r++) {
        const steps = 1 + Math.floor(rng.next() * 40) + (r % 5 === 0 ? 200 : 0);
        for (let t = 0; t < steps; t++) {
          if (rng.next() < 0.1) continue; // a gap: the step is missing
          const reading = rng.next() < 0.1 ? '' : floor.surfaces[Math.floor(rng.next() * 3)];
          rows.push(`run-${r},${t},${reading}`);
        }
      }
      // Interleave the runs' rows: the annotated table keeps this order.
      for (let k = rows.length - 1; k > 0; k--) {
        const j = Math.floor(rng.next() * (k + 1));
        [rows[k], rows[j]] = [rows[j], rows[k]];
      }
      return `run,step,reading\n${rows.join('\n')}\n`;
    };
    const tables = [
      runsFromCsv(makeCsv(0, 13), 'a.csv', { surfaces: floor.surfaces }),
      runsFromCsv(makeCsv(13, 8), 'b.csv', { surfaces: floor.surfaces }),
    ];
    const th = { lowConfidence: 0.5, surprisingBits: 6 };
    const out = decodeRuns(model, tables, th, () => 'fit');

    const chain = chainFromModel(model);
    const log = logChain(chain);
    const layout = positionLayout(model);
    const col = (name: string) => out.annotated.columns.find((c) => c.name === name)!;
    let base = 0;
    let index = 0;
    let gaps = 0;
    for (const table of tables) {
      for (const run of table.runs) {
        const want = decodeRun(chain, log, run.obs, { positions: layout.groups });
        expect(out.summaries[index].run).toBe(run.id);
        expect(out.summaries[index].loglik).toBe(want.logLik);
        expect(out.summaries[index].pathLogprob).toBe(want.pathLogProb);
        for (let t = 0; t < run.obs.length; t++) {
          const row = run.rows[t];
          if (row < 0) {
            gaps++;
            continue;
          }
          const g = base + row;
          expect(col('path_cell').get(g)).toBe(model.cells[want.path[t]].id);
          expect(col('path_p').get(g)).toBe(want.pathP[t]);
          expect(col('likely_cell').get(g)).toBe(model.cells[want.likelyCell[t]].id);
          expect(col('likely_p').get(g)).toBe(want.likelyP[t]);
          expect(col('entropy_bits').get(g)).toBe(want.entropyBits[t]);
          expect(col('surprise_bits').get(g)).toBe(Number.isNaN(want.surpriseBits[t]) ? null : want.surpriseBits[t]);
          expect(col('zone_p').get(g)).toBe(want.positions!.zoneP[t]);
          expect(col('spread_m').get(g)).toBe(want.positions!.spreadM[t]);
        }
        index++;
      }
      base += table.nRows;
    }
    expect(index).toBe(21);
    expect(gaps).toBeGreaterThan(0);
  });
});
