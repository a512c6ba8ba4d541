import { format } from 'd3-format';

const fixed3 = format('.3f');
const fixed5 = format('.5f');
const percent1 = format('.1%');
const percentShort = format('.2~%');
const grouped = format(',d');
const general3 = format('.3~g');

/**
 * Number formats used across the report; a missing value (NaN, null, ±Infinity where not meaningful)
 * is shown as an en dash. `kind`: `ll` log-likelihood per reading (5 decimals: restarts often differ in the fourth), `p` probability
 * (3 decimals), `pct` percentage (1 decimal), `pct~` percentage without trailing zeros (legend ticks), `int` grouped integer, `g` 3 significant digits.
 */
export function formatNumber(value: number | null | undefined, kind: 'll' | 'p' | 'pct' | 'pct~' | 'int' | 'g'): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '–';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
  let text: string;
  switch (kind) {
    case 'll':
      text = fixed5(value);
      break;
    case 'p':
      text = fixed3(value);
      break;
    case 'pct':
      text = percent1(value);
      break;
    case 'pct~':
      text = percentShort(value);
      break;
    case 'int':
      text = grouped(Math.round(value));
      break;
    case 'g':
      text = general3(value);
      break;
  }
  return text;
}
