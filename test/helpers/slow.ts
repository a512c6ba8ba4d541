import { it } from 'vitest';

/**
 * A test that takes seconds rather than milliseconds: it starts worker threads (each loads the
 * TypeScript sources through tsx), runs many statistical trials, a whole re-fit search or a 10⁶-step
 * run. `npm test` runs it; `npm run test:unit` (the fast inner loop, which sets UNDERFOOT_SKIP_SLOW=1)
 * lists it as skipped. DEVELOPERS.md, "Tests", says which tests are marked and why.
 */
export const itSlow: typeof it = process.env.UNDERFOOT_SKIP_SLOW === '1' ? (it.skip as typeof it) : it;
