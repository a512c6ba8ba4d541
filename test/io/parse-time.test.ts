import { describe, it, expect } from 'vitest';
import { formatPeriod, parseIso8601, parsePeriod, parseTime } from '../../src/io/parse-time.js';
import { expectClose } from '../helpers/close.js';

describe('parseTime', () => {
  it('reads plain numbers as seconds', () => {
    expect(parseTime('12.5')).toBe(12.5);
    expect(parseTime(3)).toBe(3);
    expect(parseTime(7n)).toBe(7);
    expect(parseTime('')).toBeNaN();
    expect(parseTime('yesterday')).toBeNaN();
  });
  it('reads ISO 8601 text as seconds since 1970 UTC; no offset = UTC', () => {
    // Source: 2026-03-01T00:00:00Z is 1772323200 s since the epoch (Date.UTC(2026, 2, 1) / 1000 in Node).
    expect(parseIso8601('2026-03-01T00:00:00Z')).toBe(1772323200);
    expect(parseIso8601('2026-03-01 00:00:00')).toBe(1772323200);
    expectClose(parseIso8601('2026-03-01T09:30:00.250Z'), 1772323200 + 9.5 * 3600 + 0.25, { abs: 1e-6 });
    expectClose(parseIso8601('2026-03-01T09:30:00.000125Z'), 1772323200 + 9.5 * 3600 + 0.000125, { abs: 1e-6 });
    expect(parseIso8601('2026-03-01T10:30:00+01:00')).toBe(1772323200 + 9.5 * 3600);
    expect(parseIso8601('2026-03-01T08:30:00-0100')).toBe(1772323200 + 9.5 * 3600);
    expect(parseIso8601('2026-02-30T00:00:00Z')).toBeNaN();
    expect(parseIso8601('2026-13-01')).toBeNaN();
    expect(parseIso8601('01/03/2026')).toBeNaN();
  });
});

describe('parsePeriod / formatPeriod', () => {
  it('reads ms and s', () => {
    expectClose(parsePeriod('100ms'), 0.1, { abs: 1e-12 });
    expect(parsePeriod('0.5s')).toBe(0.5);
    expect(parsePeriod('2 s')).toBe(2);
    for (const bad of ['5min', '0ms', '-1s', '100', 'ms']) expect(parsePeriod(bad)).toBeNaN();
  });
  it('writes a period as users write it', () => {
    expect(formatPeriod(0.1)).toBe('100 ms');
    expect(formatPeriod(0.10049)).toBe('100.5 ms');
    expect(formatPeriod(2)).toBe('2 s');
  });
});
