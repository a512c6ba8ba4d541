import { InputError, quote } from '../errors.js';

/**
 * Readers of raw numeric options — flags (strings) or a pipeline section (JSON values) — that fall back
 * to a default when the option is absent and otherwise check it: "<where>: <flag> must be
 * <requirement>, got <value>" (InputError).
 */
export function optionReader(raw: Record<string, unknown>, where: string, flag: (key: string) => string) {
  const num = (key: string, def: number, ok: (v: number) => boolean, requirement: string): number => {
    const v = raw[key];
    if (v === undefined || v === null) return def;
    const x = typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN;
    if (!Number.isFinite(x) || !ok(x)) throw new InputError(`${where}: ${flag(key)} must be ${requirement}, got ${quote(v)}`);
    return x;
  };
  const int = (key: string, def: number, min: number, max = Number.MAX_SAFE_INTEGER): number =>
    num(key, def, (x) => Number.isInteger(x) && x >= min && x <= max, `a whole number from ${min}${max < Number.MAX_SAFE_INTEGER ? ` to ${max}` : ' up'}`);
  return { num, int };
}
