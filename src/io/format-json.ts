/**
 * JSON text that a person can read and a diff can follow: objects one key per line, but arrays of
 * numbers/strings and objects holding only such values on one line (a cell, a link, an emission row).
 * Numbers use JavaScript's shortest round-trip form, so parse → format gives the same bytes.
 * Non-finite numbers are refused (JSON cannot hold them).
 */
export function formatJson(value: unknown, indent = ''): string {
  if (value === null || typeof value !== 'object') return scalar(value);
  const inner = `${indent}  `;
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    if (value.every(isFlat)) return `[${value.map((v) => formatJson(v, inner)).join(', ')}]`;
    return `[\n${value.map((v) => inner + formatJson(v, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return '{}';
  if (entries.every(([, v]) => isScalar(v) || (Array.isArray(v) && v.every(isScalar) && v.length <= 12))) {
    return `{ ${entries.map(([k, v]) => `${JSON.stringify(k)}: ${formatJson(v, inner)}`).join(', ')} }`;
  }
  return `{\n${entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${formatJson(v, inner)}`).join(',\n')}\n${indent}}`;
}

function isScalar(v: unknown): boolean {
  return v === null || typeof v !== 'object';
}

function isFlat(v: unknown): boolean {
  if (isScalar(v)) return true;
  if (Array.isArray(v)) return v.every(isScalar);
  return Object.values(v as Record<string, unknown>).every((x) => isScalar(x) || (Array.isArray(x) && x.every(isScalar) && x.length <= 12));
}

function scalar(v: unknown): string {
  if (typeof v === 'number' && !Number.isFinite(v)) {
    throw new RangeError(`formatJson: numbers must be finite, got ${v}`);
  }
  return JSON.stringify(v);
}
