/**
 * Seed for fast-check properties: `UNDERFOOT_FC_SEED=<n>` replays a run; under CI (`CI` set) a fixed
 * seed keeps the gate reproducible; otherwise a fresh seed is drawn each run, so local runs keep
 * exploring. The seed is printed either way so that any failure can be replayed.
 */
export const fcSeed: number = process.env.UNDERFOOT_FC_SEED
  ? Number(process.env.UNDERFOOT_FC_SEED)
  : process.env.CI
    ? 20261202
    : Math.floor(Math.random() * 2 ** 31);
// eslint-disable-next-line no-console
console.log(`fast-check seed: ${fcSeed} (replay with UNDERFOOT_FC_SEED=${fcSeed})`);
