import { escapeHtml } from './escape-html.js';
import { MUTED_INK, INK } from './palette.js';

/** A continuous scale as d3-scale makes them (linear, log, …): maps values, offers ticks. */
export interface TickScale {
  (value: number): number;
  ticks(count?: number): number[];
  tickFormat(count?: number, specifier?: string): (v: number) => string;
  range(): number[];
}

export interface AxisOptions {
  /** Where the axis line lies: y for a bottom axis, x for a left axis. */
  at: number;
  /** Tick label format; by default the scale's own (d3 picks the precision the tick step needs). */
  format?: (v: number) => string;
  /** Plain-text axis title. */
  title: string;
  /** Tick count hint. @default 5 */
  ticks?: number;
  /** Extent of grid lines across the plot (the other axis's pixel range); none when absent. */
  grid?: [number, number];
}

/**
 * A bottom (x) or left (y) axis of a d3 scale as SVG: axis line, ticks at the scale's nice values,
 * labels, optional light grid lines and a title.
 */
export function svgAxis(orientation: 'bottom' | 'left', scale: TickScale, o: AxisOptions): string {
  const [r0, r1] = scale.range();
  const ticks = scale.ticks(o.ticks ?? 5);
  const format = o.format ?? scale.tickFormat(o.ticks ?? 5);
  const parts: string[] = [`<g class="axis" font-size="10" fill="${MUTED_INK}">`];
  if (orientation === 'bottom') {
    for (const t of ticks) {
      const x = scale(t).toFixed(1);
      if (o.grid) parts.push(`<line x1="${x}" x2="${x}" y1="${o.grid[0]}" y2="${o.grid[1]}" stroke="#e6e3da"/>`);
      parts.push(`<line x1="${x}" x2="${x}" y1="${o.at}" y2="${o.at + 4}" stroke="${MUTED_INK}"/><text x="${x}" y="${o.at + 15}" text-anchor="middle">${escapeHtml(format(t))}</text>`);
    }
    parts.push(`<line x1="${Math.min(r0, r1)}" x2="${Math.max(r0, r1)}" y1="${o.at}" y2="${o.at}" stroke="${MUTED_INK}"/>`);
    parts.push(`<text x="${((r0 + r1) / 2).toFixed(1)}" y="${o.at + 31}" text-anchor="middle" fill="${INK}" font-size="11">${escapeHtml(o.title)}</text>`);
  } else {
    for (const t of ticks) {
      const y = scale(t).toFixed(1);
      if (o.grid) parts.push(`<line x1="${o.grid[0]}" x2="${o.grid[1]}" y1="${y}" y2="${y}" stroke="#e6e3da"/>`);
      parts.push(`<line x1="${o.at - 4}" x2="${o.at}" y1="${y}" y2="${y}" stroke="${MUTED_INK}"/><text x="${o.at - 7}" y="${y}" dy="0.32em" text-anchor="end">${escapeHtml(format(t))}</text>`);
    }
    parts.push(`<line x1="${o.at}" x2="${o.at}" y1="${Math.min(r0, r1)}" y2="${Math.max(r0, r1)}" stroke="${MUTED_INK}"/>`);
    const mid = ((r0 + r1) / 2).toFixed(1);
    parts.push(`<text transform="translate(${o.at - 52},${mid}) rotate(-90)" text-anchor="middle" fill="${INK}" font-size="11">${escapeHtml(o.title)}</text>`);
  }
  parts.push('</g>');
  return parts.join('');
}
