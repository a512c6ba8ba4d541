/**
 * Seed for fast-check properties: `UNDERFOOT_FC_SEED=<n>` replays a run; otherwise a fresh seed is drawn
 * and printed so that a failure can be replayed.
 */
export const fcSeed: number = process.env.UNDERFOOT_FC_SEED
  ? Number(process.env.UNDERFOOT_FC_SEED)
  : Math.floor(Math.random() * 2 ** 31);
// eslint-disable-next-line no-console
console.log(`fast-check seed: ${fcSeed} (replay with UNDERFOOT_FC_SEED=${fcSeed})`);
