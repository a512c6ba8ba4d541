/**
 * Time values of a runs table's time column (`--time-col`), as seconds (float64): plain numbers (and
 * numeric text) are seconds; ISO 8601 text `YYYY-MM-DD[T| ]hh:mm[:ss[.fff…]][Z|±hh[:mm]]` is seconds since
 * 1970-01-01 UTC (text without an offset is read as UTC, never as the machine's local time). Arrow
 * timestamp and date columns are converted by their reader (parse-runs.ts). NaN when not a time.
 */
export function parseTime(value: unknown): number {
  if (typeof value === 'number') return Number.isFinite(value) ? value : NaN;
  if (typeof value === 'bigint') return Number(value);
  if (typeof value !== 'string') return NaN;
  const text = value.trim();
  if (text === '') return NaN;
  if (/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) return Number(text);
  return parseIso8601(text);
}

const ISO =
  /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?$/;

/** Seconds since the epoch of an ISO 8601 date-time (UTC when no offset is written); NaN if malformed. */
export function parseIso8601(text: string): number {
  const m = ISO.exec(text);
  if (!m) return NaN;
  const [year, month, day, hour, minute, second] = [1, 2, 3, 4, 5, 6].map((k) => (m[k] === undefined ? 0 : Number(m[k])));
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 24 || minute > 59 || second > 60) return NaN;
  const ms = Date.UTC(year, month - 1, day, hour, minute, second);
  if (new Date(ms).getUTCDate() !== day && hour !== 24) return NaN;
  const fraction = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  let offset = 0;
  const zone = m[8];
  if (zone !== undefined && zone !== 'Z' && zone !== 'z') {
    const sign = zone[0] === '-' ? -1 : 1;
    const digits = zone.slice(1).replace(':', '');
    const oh = Number(digits.slice(0, 2));
    const om = digits.length > 2 ? Number(digits.slice(2)) : 0;
    if (oh > 23 || om > 59) return NaN;
    offset = sign * (oh * 3600 + om * 60);
  }
  return ms / 1000 + fraction - offset;
}

/**
 * A sampling period written as a number and a unit, `100ms`, `0.1s`, `2 s` (units ms, s); seconds, or
 * NaN when malformed or not > 0.
 */
export function parsePeriod(value: unknown): number {
  if (typeof value === 'number') return value > 0 && Number.isFinite(value) ? value : NaN;
  if (typeof value !== 'string') return NaN;
  const m = /^\s*(\d+\.?\d*|\.\d+)\s*(ms|s)\s*$/.exec(value);
  if (!m) return NaN;
  const x = Number(m[1]) * (m[2] === 'ms' ? 1e-3 : 1);
  return x > 0 && Number.isFinite(x) ? x : NaN;
}

/** A period in seconds as users write it: `100 ms` below one second, else `1.5 s` (4 significant digits). */
export function formatPeriod(seconds: number): string {
  const fmt = (x: number) => String(Number(x.toPrecision(4)));
  return seconds < 1 ? `${fmt(seconds * 1000)} ms` : `${fmt(seconds)} s`;
}
