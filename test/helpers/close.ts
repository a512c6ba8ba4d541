import { expect } from 'vitest';

/** Tolerances for float comparisons: pass when |a − e| ≤ abs + rel · |e|. */
export interface Tolerance {
  abs?: number;
  rel?: number;
}

export function expectClose(actual: number, expected: number, tol: Tolerance, label = ''): void {
  const abs = tol.abs ?? 0;
  const rel = tol.rel ?? 0;
  const ok = Math.abs(actual - expected) <= abs + rel * Math.abs(expected) || (actual === expected);
  if (!ok) {
    expect.fail(`${label ? `${label}: ` : ''}expected ${expected} ± (${abs} + ${rel}·|e|), got ${actual} (diff ${actual - expected})`);
  }
}

export function expectAllClose(actual: ArrayLike<number>, expected: ArrayLike<number>, tol: Tolerance, label = ''): void {
  expect(actual.length, `${label} length`).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) expectClose(actual[i], expected[i], tol, `${label}[${i}]`);
}
