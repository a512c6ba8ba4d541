/** A table value as a number: numbers as they are, bigints and numeric text converted, null and empty text as NaN. */
export function numericValue(value: string | number | bigint | boolean | null): number {
  if (value === null || value === '' || typeof value === 'boolean') return NaN;
  return typeof value === 'number' ? value : Number(value);
}
