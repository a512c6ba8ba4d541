import type { HmmModel } from '../../src/model/hmm-model.js';
import { buildStructure } from '../../src/model/build-structure.js';
import { SeededRandom } from '../../src/model/seeded-random.js';

export interface RandomModelOptions {
  nCells: number;
  nReadings: number;
  /** Links per cell drawn at random (before de-duplication). @default 2 */
  linksPerCell?: number;
  /** Smallest probability before normalisation, to keep models away from zero. @default 0.02 */
  floor?: number;
  /** Fraction of cells that may start; all when 1. @default 1 */
  startShare?: number;
}

/** Invented test model: random sparse links (dwell always), random positive probabilities, seeded. */
export function randomModel(seed: number, o: RandomModelOptions): HmmModel {
  const rng = new SeededRandom(seed);
  const n = o.nCells;
  const m = o.nReadings;
  const edges: Array<[number, number]> = [];
  if (n > 1) {
    for (let i = 0; i < n; i++) {
      // A ring keeps every cell reachable and with a way out; extra random links on top.
      edges.push([i, (i + 1) % n]);
      for (let l = 1; l < (o.linksPerCell ?? 2); l++) {
        const j = rng.int(n);
        if (j !== i) edges.push([i, j]);
      }
    }
  }
  const structure = buildStructure(n, edges);
  const lo = o.floor ?? 0.02;
  const trans = new Float64Array(structure.nnz);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let k = structure.succPtr[i]; k < structure.succPtr[i + 1]; k++) sum += trans[k] = lo + rng.next();
    for (let k = structure.succPtr[i]; k < structure.succPtr[i + 1]; k++) trans[k] /= sum;
  }
  const emission = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += emission[i * m + r] = lo + rng.next();
    for (let r = 0; r < m; r++) emission[i * m + r] /= sum;
  }
  const start = new Float64Array(n);
  const share = o.startShare ?? 1;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += start[i] = i === 0 || rng.next() < share ? lo + rng.next() : 0;
  for (let i = 0; i < n; i++) start[i] /= sum;
  const surfaces = Array.from({ length: m }, (_, r) => `s${r}`);
  return {
    surfaces,
    cells: Array.from({ length: n }, (_, i) => ({ id: `c${i}`, surface: surfaces[i % m], x: i, y: 0, level: 0 })),
    structure,
    start,
    trans,
    emission,
  };
}

/** Dense n × n transition matrix of a model (zeros where no nonzero exists). */
export function denseTransitions(model: HmmModel): number[][] {
  const s = model.structure;
  const a = Array.from({ length: s.nCells }, () => new Array<number>(s.nCells).fill(0));
  for (let i = 0; i < s.nCells; i++) for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) a[i][s.succIdx[k]] = model.trans[k];
  return a;
}
