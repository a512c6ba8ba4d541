import { describe, it, expect } from 'vitest';
import { emConverged } from '../../src/fit/em-converged.js';

describe('emConverged (stopping rule)', () => {
  it('plain rule: stops when the last relative change is at most tol', () => {
    expect(emConverged([-1], 1e-6, false)).toBe(false);
    expect(emConverged([-1, -0.9999995], 1e-6, false)).toBe(true);
    expect(emConverged([-1, -0.999998], 1e-6, false)).toBe(false);
  });

  it('projected rule: a small change at a rate near 1 is not convergence (the gain still to come is ~Δ·a/(1 − a))', () => {
    // Changes 1e-6·0.99^k: each below tol = 2e-6, but about 99 times as much still to come.
    const creeping = [-1];
    for (let k = 0; k < 5; k++) creeping.push(creeping[k] + 1e-6 * 0.99 ** k);
    expect(emConverged(creeping, 2e-6, false)).toBe(true);
    expect(emConverged(creeping, 2e-6, true)).toBe(false);
    // The same changes at rate 0.5: about as much to come as the last change, below tol.
    const fast = [-1];
    for (let k = 0; k < 5; k++) fast.push(fast[k] + 1e-6 * 0.5 ** k);
    expect(emConverged(fast, 2e-6, true)).toBe(true);
  });

  it('projected rule never stops earlier than the plain one; a flat or accelerating objective falls back or continues', () => {
    expect(emConverged([-1, -0.99, -0.98], 1e-6, true)).toBe(false);
    expect(emConverged([-1, -1, -1], 1e-6, true)).toBe(true);
    // Accelerating (rate ≥ 1): the change grows, so it does not stop though the change is small.
    expect(emConverged([-1, -1 + 1e-8, -1 + 3e-8], 1e-6, true)).toBe(false);
    // Only two objectives: the projected rule needs a rate, so it waits unless nothing changed.
    expect(emConverged([-1, -1 + 1e-8], 1e-6, true)).toBe(false);
  });
});
