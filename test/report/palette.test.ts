import { describe, it, expect } from 'vitest';
import { SURFACE_COLOURS, RAMP_STOPS, VERDICT_COLOURS, rampColour, surfaceColour, surfaceHatched } from '../../src/report/palette.js';
import { DICHROMACY, deltaE, labAs, type Vision } from './colour-vision.js';
import { expectClose } from '../helpers/close.js';

const VISIONS: Vision[] = ['normal', 'protanopia', 'deuteranopia', 'tritanopia'];

describe('colour-vision helper', () => {
  it('every simulation matrix row sums to 1 (white stays white; guards the recalled values)', () => {
    for (const m of Object.values(DICHROMACY)) for (const row of m) expectClose(row[0] + row[1] + row[2], 1, { abs: 2e-6 });
  });
  it('labAs gives L* = 100 for white and 0 for black, and ΔE of a colour with itself is 0', () => {
    // Source: CIE 15:2004 — the reference white has L* = 100, a* = b* = 0.
    const white = labAs('#ffffff', 'normal');
    expectClose(white[0], 100, { abs: 1e-3 });
    expectClose(white[1], 0, { abs: 1e-2 });
    expectClose(white[2], 0, { abs: 1e-2 });
    expectClose(labAs('#000000', 'normal')[0], 0, { abs: 1e-9 });
    expect(deltaE('#2f5d8c', '#2f5d8c', 'deuteranopia')).toBe(0);
  });
  it('labAs matches a published sRGB → L*a*b* value: pure red is L* 53.24, a* 80.09, b* 67.20', () => {
    // Source: Bruce Lindbloom's colour calculator (sRGB, D65) — widely quoted value for #ff0000; recalled from memory.
    const [L, a, b] = labAs('#ff0000', 'normal');
    expectClose(L, 53.24, { abs: 0.02 });
    expectClose(a, 80.09, { abs: 0.05 });
    expectClose(b, 67.2, { abs: 0.05 });
  });
});

describe('palette', () => {
  it('surface colours stay ≥ 12 ΔE*ab apart for normal, protan, deutan and tritan vision', () => {
    for (const vision of VISIONS) {
      let min = Infinity;
      for (let i = 0; i < SURFACE_COLOURS.length; i++) {
        for (let j = i + 1; j < SURFACE_COLOURS.length; j++) min = Math.min(min, deltaE(SURFACE_COLOURS[i], SURFACE_COLOURS[j], vision));
      }
      expect(min, vision).toBeGreaterThanOrEqual(12);
    }
  });
  it('surface colours spread over more than 55 units of lightness, so they separate in grey too', () => {
    const L = SURFACE_COLOURS.map((c) => labAs(c, 'normal')[0]);
    expect(Math.max(...L) - Math.min(...L)).toBeGreaterThan(55);
  });
  it('the sequential ramp falls strictly in lightness from 0 to 1 for every kind of vision', () => {
    for (const vision of VISIONS) {
      let prev = Infinity;
      for (let k = 0; k <= 50; k++) {
        const L = labAs(rampColour(k / 50), vision)[0];
        expect(L, `${vision} at ${k / 50}`).toBeLessThan(prev);
        prev = L;
      }
    }
  });
  it('rampColour clamps and hits its end stops', () => {
    expect(rampColour(-1)).toBe(rampColour(0));
    expect(rampColour(2)).toBe(rampColour(1));
    expect(deltaE(rampColour(0), RAMP_STOPS[0], 'normal')).toBeLessThan(1);
    expect(deltaE(rampColour(1), RAMP_STOPS[RAMP_STOPS.length - 1], 'normal')).toBeLessThan(1);
  });
  it('changed cells stand out from unchanged ones for every kind of vision (ΔE ≥ 25)', () => {
    for (const vision of VISIONS) expect(deltaE(VERDICT_COLOURS.changed, VERDICT_COLOURS.unchanged, vision), vision).toBeGreaterThanOrEqual(25);
  });
  it('surfaceColour repeats after eight colours and marks the repeats hatched', () => {
    expect(surfaceColour(8)).toBe(surfaceColour(0));
    expect(surfaceHatched(7)).toBe(false);
    expect(surfaceHatched(8)).toBe(true);
  });
});
