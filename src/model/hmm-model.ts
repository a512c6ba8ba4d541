/**
 * Parameter types of the floor hidden Markov model: hidden state = cell, observation = reading.
 * Index rules: emission rows are row-major cells × readings, `i * nReadings + r`; transition
 * probabilities are stored once, in CSR order of `TransitionStructure` (see `src/kernels/sparse-chain.ts`).
 */

/** How transitions are treated during fitting (README.md, "Transition modes"). */
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
  /**
   * Movement parameters (per-step transitions from wheel odometry, see `MovementParams`); absent for a
   * model fitted without movement columns.
   */
  movement?: MovementParams;
}

/**
 * How odometry shapes the transitions (DEVELOPERS.md, "Movement"): the chance of staying put after the
 * wheels moved d metres is s(d) = σ(stayLogit − stayPerMetre · d) (logistic), and a link whose bearing
 * is θ gets the weight exp(kappa · cos(h − θ)) (von Mises) when the heading of travel h is known.
 */
export interface MovementParams {
  stayLogit: number;
  stayPerMetre: number;
  kappa: number;
}
