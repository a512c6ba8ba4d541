import { describe, it, expect } from 'vitest';
import { deflateSync } from 'node:zlib';
import { decodePng, pixelStats } from './decode-png.js';

/** Builds a PNG by hand (CRCs are not checked by the decoder, so zeros do). */
function png(width: number, height: number, colourType: 2 | 6, lines: Array<[number, number[]]>): Uint8Array {
  const chunk = (type: string, data: Uint8Array): Buffer => {
    const head = Buffer.alloc(8);
    head.writeUInt32BE(data.length, 0);
    head.write(type, 4, 'latin1');
    return Buffer.concat([head, Buffer.from(data), Buffer.alloc(4)]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8;
  ihdr[9] = colourType;
  const raw = Buffer.from(lines.flatMap(([filter, bytes]) => [filter, ...bytes]));
  return Buffer.concat([Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw)), chunk('IEND', new Uint8Array(0))]);
}

describe('decodePng(bytes) (test helper)', () => {
  it('undoes each of the five scanline filters', () => {
    // Two RGB pixels per line; every line decodes to [10,20,30, 40,50,60] + 10·line.
    // Source: PNG Specification 2nd ed., 9.2 — Sub adds a, Up adds b, Average adds ⌊(a+b)/2⌋, Paeth adds the predictor.
    const img = decodePng(png(2, 5, 2, [
      [0, [10, 20, 30, 40, 50, 60]],
      [1, [20, 30, 40, 30, 30, 30]], // Sub: 20,30,40 then +30 → 50,60,70
      [2, [10, 10, 10, 10, 10, 10]], // Up: previous line + 10
      [3, [25, 30, 35, 10, 10, 10]], // Average: (0 + b)>>1 then ((a + b)>>1)
      [4, [10, 10, 10, 10, 10, 10]], // Paeth
    ]));
    const line = (y: number) => Array.from(img.pixels.subarray(y * 6, y * 6 + 6));
    expect(line(0)).toEqual([10, 20, 30, 40, 50, 60]);
    expect(line(1)).toEqual([20, 30, 40, 50, 60, 70]);
    expect(line(2)).toEqual([30, 40, 50, 60, 70, 80]);
    // Average: first pixel 25 + (30>>1)=15 → 40 … ; second 10 + ((40 + 60)>>1)=50 → 60, 10 + ((50+70)>>1) → 70, 10 + ((60+80)>>1) → 80.
    expect(line(3)).toEqual([40, 50, 60, 60, 70, 80]);
    // Paeth, first pixel: a = c = 0, b = 40 → p = 40 picks b: 10 + 40 = 50; second pixel: a = 50, b = 60, c = 40 → p = 70 picks b: 10 + 60 = 70.
    expect(line(4)).toEqual([50, 60, 70, 70, 80, 90]);
  });

  it('pixelStats: a flat image has zero variance and one colour; two colours give a positive variance', () => {
    const flat = decodePng(png(2, 1, 6, [[0, [200, 200, 200, 255, 200, 200, 200, 255]]]));
    expect(pixelStats(flat)).toEqual({ variance: 0, colours: 1 });
    const two = decodePng(png(2, 1, 6, [[0, [0, 0, 0, 255, 255, 255, 255, 255]]]));
    const s = pixelStats(two);
    expect(s.colours).toBe(2);
    expect(s.variance).toBeCloseTo(127.5 * 127.5, 6);
  });
});
