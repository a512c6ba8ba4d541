import { describe, it, expect } from 'vitest';
import { runRowsFromAnnotated } from '../../src/report/run-rows-from-annotated.js';
import { meanConfidenceByCell } from '../../src/report/mean-confidence-by-cell.js';
import { decodeRuns } from '../../src/pipeline/decode-runs.js';
import { runsFromCsv } from '../../src/io/parse-runs.js';
import { tableToCsv } from '../../src/io/table-to-csv.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectClose } from '../helpers/close.js';

const surfaces = ['oak', 'carpet', 'tile'];
const floor = gridFloor(4, 2, surfaces, (x, y) => (x + 2 * y) % 3);
const model = buildModel(floor, { hit: 0.75, dwell: 0.5 });

/** Simulated runs as CSV text (invented ids), with dropouts. */
function runsCsv(): string {
  const rng = new SeededRandom(9);
  const lines = ['run,step,reading'];
  for (let k = 0; k < 4; k++) {
    const { obs } = sampleRun(model, 60, rng, 0.05);
    obs.forEach((o, t) => lines.push(`run-${k},${t},${o < 0 ? '' : surfaces[o]}`));
  }
  return `${lines.join('\n')}\n`;
}

describe('runRowsFromAnnotated(table, splitOf) and meanConfidenceByCell(model, table)', () => {
  const input = runsFromCsv(runsCsv(), 'runs.csv', { surfaces });
  const decoded = decodeRuns(model, [input], { lowConfidence: 0.5, surprisingBits: 2 }, (r) => (r === 'run-0' ? 'held-out' : 'fit'));
  const annotated = runsFromCsv(tableToCsv(decoded.annotated), 'annotated.csv', { surfaces });

  it('rebuilds the run summary from the annotated table (log-likelihood from −ln 2 · Σ surprise bits)', () => {
    const rows = runRowsFromAnnotated(annotated, (r) => (r === 'run-0' ? 'held-out' : 'fit'));
    expect(rows.map((r) => r.run)).toEqual(decoded.summaries.map((s) => s.run));
    rows.forEach((row, k) => {
      const s = decoded.summaries[k];
      expect(row.split).toBe(s.split);
      expect([row.steps, row.dropouts, row.lowConfidenceSteps, row.surprisingSteps]).toEqual([s.steps, s.dropouts, s.lowConfidenceSteps, s.surprisingSteps]);
      expectClose(row.loglikPerReading, s.loglikPerReading, { rel: 1e-9 }, `${row.run} loglik per reading`);
      expectClose(row.meanPathP, s.meanPathP, { rel: 1e-12 }, `${row.run} mean path posterior`);
    });
    expect(rows.some((r) => r.surprisingSteps > 0), 'the 2-bit threshold flags some readings').toBe(true);
  });

  it('averages path_p per path cell, and counts the steps decoded onto each cell', () => {
    const conf = meanConfidenceByCell(model, annotated);
    const ids = model.cells.map((c) => c.id);
    const pathCell = decoded.annotated.columns.find((c) => c.name === 'path_cell')!;
    const pathP = decoded.annotated.columns.find((c) => c.name === 'path_p')!;
    const sum = new Map<string, [number, number]>();
    for (let row = 0; row < decoded.annotated.nRows; row++) {
      const id = pathCell.get(row) as string;
      const [s, n] = sum.get(id) ?? [0, 0];
      sum.set(id, [s + (pathP.get(row) as number), n + 1]);
    }
    ids.forEach((id, i) => {
      const entry = sum.get(id);
      if (!entry) {
        expect(Number.isNaN(conf.meanPathP[i])).toBe(true);
        expect(conf.steps[i]).toBe(0);
      } else {
        expect(conf.steps[i]).toBe(entry[1]);
        expectClose(conf.meanPathP[i], entry[0] / entry[1], { rel: 1e-12 });
      }
    });
    expect(conf.steps.reduce((a, b) => a + b, 0)).toBe(decoded.annotated.nRows);
  });

  it('rejects an annotated table without the decoded columns, or decoded with another model', () => {
    expect(() => meanConfidenceByCell(model, input)).toThrow(/runs\.csv: the annotated table must have a "path_cell" column/);
    const other = buildModel(gridFloor(2, 1, surfaces, (x) => x), { hit: 0.8 });
    other.cells[0].id = 'elsewhere';
    other.cells[1].id = 'nowhere';
    expect(() => meanConfidenceByCell(other, annotated)).toThrow(/annotated\.csv: row 1 path_cell must name a cell of the model, got "g-/);
  });
});
