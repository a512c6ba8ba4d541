import { InputError, quote } from '../errors.js';

/**
 * The field checks shared by every JSON format's parser (floor, model, pipeline, checkpoint), all in the
 * house form `<where> <thing> must <requirement>, got <actual>`.
 */
export type JsonObject = Record<string, unknown>;

export function isObject(value: unknown): value is JsonObject {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** `quote`, except that non-finite numbers are shown as such and an empty list is named. */
export function got(value: unknown): string {
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  if (Array.isArray(value) && value.length === 0) return 'an empty list';
  return quote(value);
}

/** Fails unless `value` is an object: `<where> must be an object, got …`. */
export function expectObject(value: unknown, where: string): JsonObject {
  if (!isObject(value)) throw new InputError(`${where} must be an object, got ${got(value)}`);
  return value;
}

/** Fails on the first key of `obj` not in `allowed`: `<where> key must be one of "a", "b", got "c"`. */
export function checkKeys(obj: JsonObject, allowed: readonly string[], where: string): void {
  for (const key of Object.keys(obj)) {
    if (!allowed.includes(key)) {
      throw new InputError(`${where} key must be one of ${allowed.map((k) => quote(k)).join(', ')}, got ${quote(key)}`);
    }
  }
}

/** A lone UTF-16 surrogate (e.g. `"\ud800"` in JSON) cannot be written as UTF-8: such names are refused. */
export function isWellFormedText(s: string): boolean {
  return !/\p{Cs}/u.test(s);
}

/** Fails unless `value` is a non-empty, well-formed string: an id or a name. */
export function expectName(value: unknown, where: string, thing = 'a non-empty string'): string {
  if (typeof value !== 'string' || value === '') throw new InputError(`${where} must be ${thing}, got ${got(value)}`);
  if (!isWellFormedText(value)) throw new InputError(`${where} must be well-formed Unicode text, got ${got(value)} with a lone surrogate`);
  return value;
}

/** Fails unless `value` is a finite number with |value| ≤ `limit` (so later sums and squares stay finite). */
export function expectFinite(value: unknown, where: string, limit = Number.MAX_VALUE, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || Math.abs(value) > limit) {
    const range = limit === Number.MAX_VALUE ? 'a finite number' : `a finite number of at most ${limit} in size`;
    throw new InputError(`${where} must be ${range}${unit}, got ${got(value)}`);
  }
  return value;
}

/** Fails unless `value` is a whole number in [min, max]. */
export function expectInteger(value: unknown, where: string, min = Number.MIN_SAFE_INTEGER, max = Number.MAX_SAFE_INTEGER): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value < min || value > max) {
    const range = min === Number.MIN_SAFE_INTEGER ? 'an integer' : `a whole number from ${min}${max === Number.MAX_SAFE_INTEGER ? ' up' : ` to ${max}`}`;
    throw new InputError(`${where} must be ${range}, got ${got(value)}`);
  }
  return value;
}

/** Fails unless `value` is a list; `each` checks every item (its `where` is `<where>[i]`). */
export function expectList<T>(value: unknown, where: string, each: (item: unknown, where: string, i: number) => T): T[] {
  if (!Array.isArray(value)) throw new InputError(`${where} must be a list, got ${got(value)}`);
  return value.map((item, i) => each(item, `${where}[${i}]`, i));
}

export function expectString(value: unknown, where: string): string {
  if (typeof value !== 'string') throw new InputError(`${where} must be a string, got ${got(value)}`);
  if (!isWellFormedText(value)) throw new InputError(`${where} must be well-formed Unicode text, got ${got(value)} with a lone surrogate`);
  return value;
}

export function expectBoolean(value: unknown, where: string): boolean {
  if (typeof value !== 'boolean') throw new InputError(`${where} must be true or false, got ${got(value)}`);
  return value;
}
