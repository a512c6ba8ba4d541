/**
 * Joins items for a one-line message, keeping at most `max` of them and saying how many were left out:
 * `oak, carpet, tile and 4 more`.
 */
export function listForMessage(items: readonly string[], max = 10): string {
  if (items.length === 0) return 'none';
  if (items.length <= max) return items.join(', ');
  return `${items.slice(0, max).join(', ')} and ${items.length - max} more`;
}
