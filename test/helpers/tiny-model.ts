import type { HmmModel } from '../../src/model/hmm-model.js';
import { buildStructure } from '../../src/model/build-structure.js';

/**
 * A model given densely (for worked examples): `trans[i][j]` (zeros are absent transitions),
 * `emission[i][r]`, `start[i]`. Cells are named `c0`, `c1`, … unless names are given.
 */
export function tinyModel(
  start: number[],
  trans: number[][],
  emission: number[][],
  surfaces: string[],
  names?: string[],
): HmmModel {
  const n = start.length;
  const edges: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (i !== j && trans[i][j] > 0) edges.push([i, j]);
  const structure = buildStructure(n, edges);
  const t = new Float64Array(structure.nnz);
  for (let i = 0; i < n; i++) {
    for (let k = structure.succPtr[i]; k < structure.succPtr[i + 1]; k++) t[k] = trans[i][structure.succIdx[k]];
  }
  return {
    surfaces,
    cells: Array.from({ length: n }, (_, i) => ({ id: names?.[i] ?? `c${i}`, surface: surfaces[0], x: i, y: 0, level: 0 })),
    structure,
    start: Float64Array.from(start),
    trans: t,
    emission: Float64Array.from(emission.flat()),
  };
}
