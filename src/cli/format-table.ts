/** Plain text table: a header row, columns padded, numbers right-aligned. */
export function formatTable(header: string[], rows: Array<Array<string | number>>): string {
  const cells = [header, ...rows.map((r) => r.map((v) => String(v)))];
  const widths = header.map((_, c) => Math.max(...cells.map((r) => r[c].length)));
  const numeric = header.map((_, c) => rows.every((r) => typeof r[c] === 'number' || /^[-+−]?[\d.]+$/.test(String(r[c]))));
  return `${cells
    .map((r) => r.map((v, c) => (numeric[c] ? v.padStart(widths[c]) : v.padEnd(widths[c]))).join('  ').trimEnd())
    .join('\n')}\n`;
}
