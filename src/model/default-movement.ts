import type { MovementParams } from './hmm-model.js';

/**
 * Movement parameters a fit starts from when no warm start has them (and holds in `fixed` mode):
 * staying put is likely after no movement (s(0) = σ(3) ≈ 0.95) and even odds after 0.5 m
 * (s(0.5) = σ(0) = 0.5), a mild preference for links along the heading (κ = 1).
 */
export const DEFAULT_MOVEMENT: MovementParams = { stayLogit: 3, stayPerMetre: 6, kappa: 1 };
