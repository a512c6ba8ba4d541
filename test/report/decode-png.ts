import { inflateSync } from 'node:zlib';

/** An 8-bit RGB or RGBA image as decoded from PNG. */
export interface DecodedPng {
  width: number;
  height: number;
  /** Samples per pixel: 3 (RGB) or 4 (RGBA). */
  channels: number;
  pixels: Uint8Array;
}

/**
 * A minimal PNG decoder for test screenshots: 8-bit truecolour (colour type 2) or truecolour with alpha
 * (type 6), not interlaced. Chunks, zlib data and the five scanline filters as the PNG specification
 * defines them (W3C, Portable Network Graphics (PNG) Specification, 2nd ed., sections 5.3, 9.2 and 9.4
 * for the Paeth predictor). Anything else throws.
 */
export function decodePng(bytes: Uint8Array): DecodedPng {
  const signature = [137, 80, 78, 71, 13, 10, 26, 10];
  signature.forEach((b, k) => {
    if (bytes[k] !== b) throw new Error('not a PNG file');
  });
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let pos = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const idat: Uint8Array[] = [];
  while (pos < bytes.length) {
    const length = view.getUint32(pos);
    const type = String.fromCharCode(...bytes.subarray(pos + 4, pos + 8));
    const data = bytes.subarray(pos + 8, pos + 8 + length);
    if (type === 'IHDR') {
      width = view.getUint32(pos + 8);
      height = view.getUint32(pos + 12);
      const depth = data[8];
      const colourType = data[9];
      if (depth !== 8 || (colourType !== 2 && colourType !== 6) || data[12] !== 0) throw new Error(`unsupported PNG: depth ${depth}, colour type ${colourType}, interlace ${data[12]}`);
      channels = colourType === 6 ? 4 : 3;
    } else if (type === 'IDAT') {
      idat.push(data);
    } else if (type === 'IEND') {
      break;
    }
    pos += 12 + length;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    const out = y * stride;
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? pixels[out + x - channels] : 0;
      const b = y > 0 ? pixels[out - stride + x] : 0;
      const c = x >= channels && y > 0 ? pixels[out - stride + x - channels] : 0;
      let predicted: number;
      switch (filter) {
        case 0: predicted = 0; break;
        case 1: predicted = a; break;
        case 2: predicted = b; break;
        case 3: predicted = (a + b) >> 1; break;
        case 4: {
          const p = a + b - c;
          const pa = Math.abs(p - a);
          const pb = Math.abs(p - b);
          const pc = Math.abs(p - c);
          predicted = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
          break;
        }
        default: throw new Error(`bad PNG filter ${filter} on line ${y}`);
      }
      pixels[out + x] = (line[x] + predicted) & 0xff;
    }
  }
  return { width, height, channels, pixels };
}

/** Variance of the pixels' luma (0.299 R + 0.587 G + 0.114 B, ITU-R BT.601), and the number of distinct colours. */
export function pixelStats(img: DecodedPng): { variance: number; colours: number } {
  let sum = 0;
  let sumSq = 0;
  const n = img.width * img.height;
  const colours = new Set<number>();
  for (let p = 0; p < n; p++) {
    const o = p * img.channels;
    const r = img.pixels[o];
    const g = img.pixels[o + 1];
    const b = img.pixels[o + 2];
    const luma = 0.299 * r + 0.587 * g + 0.114 * b;
    sum += luma;
    sumSq += luma * luma;
    if (colours.size < 100000) colours.add((r << 16) | (g << 8) | b);
  }
  const mean = sum / n;
  return { variance: sumSq / n - mean * mean, colours: colours.size };
}
