/**
 * Parameter types of the floor hidden Markov model: hidden state = cell, observation = reading.
 * Index rules: emission rows are row-major cells × readings, `i * nReadings + r`; transition
 * probabilities are stored once, in CSR order of `TransitionStructure` (see `src/kernels/sparse-chain.ts`).
 */

/** How transitions are treated during fitting (CONTRACT.md, `fit --transitions`). */
export type TransitionMode = 'fixed' | 'tied' | 'per-cell' | 'learned';

/** Sparse transition structure: every cell's dwell plus its links, in CSR and CSC over the same nonzeros. */
export interface TransitionStructure {
  nCells: number;
  nnz: number;
  succPtr: Int32Array;
  succIdx: Int32Array;
  predPtr: Int32Array;
  predIdx: Int32Array;
  /** CSR position of each CSC entry. */
  predToSucc: Int32Array;
  /** CSR position of each cell's dwell (self) transition. */
  dwellPos: Int32Array;
}

export interface ModelCell {
  id: string;
  /** Surveyed surface (nominal). */
  surface: string;
  x: number;
  y: number;
  level: number;
  /** The floor's zone of the cell; absent when it has none (model files then carry no "zone" key). */
  zone?: string;
}

export interface HmmModel {
  /** Reading alphabet. */
  surfaces: string[];
  cells: ModelCell[];
  structure: TransitionStructure;
  /** Start probabilities, length nCells. */
  start: Float64Array;
  /** Transition probabilities in CSR order, length nnz; each row sums to 1. */
  trans: Float64Array;
  /** Emission table, cells × readings row-major; each row sums to 1. */
  emission: Float64Array;
}
