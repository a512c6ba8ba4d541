import { SeededRandom } from '../model/seeded-random.js';

/** The seed of each of `k` restarts, derived from the master seed (recorded in the model file). */
export function restartSeeds(masterSeed: number, k: number): number[] {
  const rng = new SeededRandom(masterSeed);
  return Array.from({ length: k }, () => rng.nextUint32() % 2147483647);
}
