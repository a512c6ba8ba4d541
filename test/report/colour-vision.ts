/**
 * Test helpers: simulated colour vision deficiency and CIELAB, to check the report's palette.
 *
 * Source (dichromacy matrices): Machado, Oliveira & Fernandes, "A Physiologically-based Model for
 * Simulation of Color Vision Deficiency", IEEE TVCG 15(6), 2009 — the severity-1.0 matrices for
 * protanopia, deuteranopia and tritanopia, applied to linear RGB. Values recalled from memory (each row
 * sums to 1, which the tests check as a guard against a mistyped entry).
 * Source (sRGB transfer function and the sRGB → XYZ matrix, D65): IEC 61966-2-1:1999.
 * Source (XYZ → CIELAB and ΔE*ab = Euclidean distance in L*a*b*): CIE 15:2004, Colorimetry, 3rd ed.
 */
export type Vision = 'normal' | 'protanopia' | 'deuteranopia' | 'tritanopia';

export const DICHROMACY: Record<Exclude<Vision, 'normal'>, number[][]> = {
  // Source: Machado et al. 2009, severity 1.0 (recalled from memory).
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

/** '#rrggbb' or 'rgb(r, g, b)' (as d3-interpolate writes) → sRGB components in [0, 1]. */
export function parseColour(colour: string): [number, number, number] {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(colour);
  if (hex) return [1, 2, 3].map((k) => parseInt(hex[k], 16) / 255) as [number, number, number];
  const rgb = /^rgb\((\d+), (\d+), (\d+)\)$/.exec(colour);
  if (rgb) return [1, 2, 3].map((k) => Number(rgb[k]) / 255) as [number, number, number];
  throw new Error(`not a colour: ${colour}`);
}

/** CIELAB (D65) of an sRGB colour as seen with the given colour vision. */
export function labAs(colour: string, vision: Vision): [number, number, number] {
  // Source: IEC 61966-2-1 (sRGB decoding).
  let lin = parseColour(colour).map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  if (vision !== 'normal') {
    const m = DICHROMACY[vision];
    lin = m.map((row) => Math.min(1, Math.max(0, row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2])));
  }
  const [r, g, b] = lin;
  // Source: IEC 61966-2-1 (linear sRGB → XYZ, D65).
  const X = 0.4124564 * r + 0.3575761 * g + 0.1804375 * b;
  const Y = 0.2126729 * r + 0.7151522 * g + 0.072175 * b;
  const Z = 0.0193339 * r + 0.119192 * g + 0.9503041 * b;
  // Source: CIE 15:2004 (XYZ → L*a*b*, white point D65 Xn = 0.95047, Zn = 1.08883).
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(X / 0.95047);
  const fy = f(Y);
  const fz = f(Z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/** ΔE*ab between two colours as seen with the given colour vision. */
export function deltaE(a: string, b: string, vision: Vision): number {
  const p = labAs(a, vision);
  const q = labAs(b, vision);
  return Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
}
