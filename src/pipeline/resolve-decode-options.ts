import { DEFAULT_THRESHOLDS, type DecodeThresholds } from '../decode/decode-thresholds.js';
import { optionReader } from './option-reader.js';

/**
 * Raw `decode` options (flags as strings, or a pipeline's `decode` section as JSON values, camelCase
 * keys) → checked flag thresholds, with the defaults for absent ones. One validator for both paths, so a
 * pipeline cannot accept a value the command line refuses; `where` and `flag` render messages as for
 * `resolveFitOptions`.
 */
export function resolveDecodeOptions(
  raw: Record<string, unknown>,
  where: string,
  flag: (key: string) => string = (k) => `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`,
): DecodeThresholds {
  const { num } = optionReader(raw, where, flag);
  return {
    lowConfidence: num('lowConfidence', DEFAULT_THRESHOLDS.lowConfidence, (x) => x >= 0 && x <= 1, 'a probability in [0, 1]'),
    surprisingBits: num('surprisingBits', DEFAULT_THRESHOLDS.surprisingBits, (x) => x >= 0, 'a number of bits ≥ 0'),
  };
}
