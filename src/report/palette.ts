import { interpolateLab, piecewise } from 'd3-interpolate';

/**
 * The report's own colours. Categorical colours (surveyed surfaces) were chosen by hand for this tool
 * and checked with simulated protanopia, deuteranopia and tritanopia (test/report/palette.test.ts):
 * every pair stays at least 12 CIELAB ΔE apart under each, and their lightness spreads from 22 to 87
 * so that they also separate in grey. The sequential ramp falls monotonically in lightness (pale cream
 * to deep navy), so order reads the same for every reader and in print.
 */
export const SURFACE_COLOURS: readonly string[] = [
  '#2f5d8c', // steel blue
  '#d08a3c', // ochre
  '#89c4e6', // sky
  '#8c3957', // wine
  '#eddc8a', // straw
  '#3f8a7a', // teal
  '#a77fbf', // violet
  '#3a332c', // umber
];

/** Ramp stops, light to dark (CIELAB lightness falls along them; interpolated in Lab). */
export const RAMP_STOPS: readonly string[] = ['#f7f2dc', '#e7cf83', '#8fbf9a', '#3f86a2', '#2c4f82', '#1b2447'];

/** Cells without data (never visited, never on a decoded path). */
export const NO_DATA_COLOUR = '#dcdad3';

/** Verdicts of a changes table: changed stands out, unchanged recedes, too few readings is neutral. */
export const VERDICT_COLOURS = { changed: '#c8553d', unchanged: '#e9e3cf', 'too-few-readings': '#a9a7a0' } as const;

/** Lines, labels and marks drawn over data. */
export const INK = '#24303d';
export const MUTED_INK = '#6b7480';

const ramp = piecewise(interpolateLab, RAMP_STOPS as string[]);

/** Colour of `t` in [0, 1] on the sequential ramp (0 lightest); values outside are clamped. */
export function rampColour(t: number): string {
  return ramp(Math.min(1, Math.max(0, t)));
}

/** Colour of the surface with index `r` in the alphabet (repeats after eight; see `surfaceHatched`). */
export function surfaceColour(r: number): string {
  return SURFACE_COLOURS[r % SURFACE_COLOURS.length];
}

/** True for surfaces beyond the eighth: they reuse a colour and are drawn hatched to stay apart. */
export function surfaceHatched(r: number): boolean {
  return r >= SURFACE_COLOURS.length;
}
