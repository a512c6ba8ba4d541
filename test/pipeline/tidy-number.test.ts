import { describe, it, expect } from 'vitest';
import { nonNegative, unitInterval } from '../../src/pipeline/tidy-number.js';

// Values seen in decoded tables before clamping: path_p 1.0000000000000007, zone_p 1.0000000000000009,
// entropy_bits −9.6e-16 (floating-point sums of posteriors).
describe('numbers written to tables', () => {
  it('unitInterval(p) clamps float overshoot to [0, 1] and keeps NaN (no value)', () => {
    expect(unitInterval(1.0000000000000007)).toBe(1);
    expect(unitInterval(1.0000000000000009)).toBe(1);
    expect(unitInterval(-1e-17)).toBe(0);
    expect(unitInterval(0.25)).toBe(0.25);
    expect(Number.isNaN(unitInterval(NaN))).toBe(true);
  });
  it('nonNegative(x) clamps −9.6e-16 to 0 and keeps other values and NaN', () => {
    expect(nonNegative(-9.6e-16)).toBe(0);
    expect(nonNegative(3.5)).toBe(3.5);
    expect(Number.isNaN(nonNegative(NaN))).toBe(true);
  });
});
