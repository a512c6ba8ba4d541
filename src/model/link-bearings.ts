import type { ModelCell, TransitionStructure } from './hmm-model.js';

/**
 * The bearing of every link (radians, floor frame: 0 = +x, counter-clockwise) in the kernels' `out`
 * order (each cell's non-dwell successors in CSR order), or NaN for a link without one: between levels,
 * or between cells at the same position.
 */
export function linkBearings(structure: TransitionStructure, cells: ReadonlyArray<Pick<ModelCell, 'x' | 'y' | 'level'>>): Float64Array {
  const s = structure;
  const out: number[] = [];
  for (let i = 0; i < s.nCells; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      const j = s.succIdx[k];
      if (j === i) continue;
      const a = cells[i];
      const b = cells[j];
      const dx = b.x - a.x;
      const dy = b.y - a.y;
      out.push(a.level !== b.level || (dx === 0 && dy === 0) ? NaN : Math.atan2(dy, dx));
    }
  }
  return Float64Array.from(out);
}
