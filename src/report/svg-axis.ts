import { escapeHtml } from './escape-html.js';
import { estimateTextWidth } from './estimate-text-width.js';
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
  /**
   * Width of the drawing (bottom axis): an end tick's label that would cross the drawing's edge is
   * anchored at its tick instead of centred, so it is never clipped. @default no limit
   */
  width?: number;
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
      const label = format(t);
      const half = estimateTextWidth(label, 10) / 2;
      const anchor = o.width !== undefined && scale(t) + half > o.width - 2 ? 'end' : scale(t) - half < 2 ? 'start' : 'middle';
      if (o.grid) parts.push(`<line x1="${x}" x2="${x}" y1="${o.grid[0]}" y2="${o.grid[1]}" stroke="#e6e3da"/>`);
      parts.push(`<line x1="${x}" x2="${x}" y1="${o.at}" y2="${o.at + 4}" stroke="${MUTED_INK}"/><text x="${x}" y="${o.at + 15}" text-anchor="${anchor}">${escapeHtml(label)}</text>`);
    }
    parts.push(`<line x1="${Math.min(r0, r1)}" x2="${Math.max(r0, r1)}" y1="${o.at}" y2="${o.at}" stroke="${MUTED_INK}"/>`);
    parts.push(`<text x="${((r0 + r1) / 2).toFixed(1)}" y="${o.at + 31}" text-anchor="middle" fill="${INK}" font-size="11">${escapeHtml(o.title)}</text>`);
  } else {
    let widest = 0;
    for (const t of ticks) {
      widest = Math.max(widest, estimateTextWidth(format(t), 10));
      const y = scale(t).toFixed(1);
      if (o.grid) parts.push(`<line x1="${o.grid[0]}" x2="${o.grid[1]}" y1="${y}" y2="${y}" stroke="#e6e3da"/>`);
      parts.push(`<line x1="${o.at - 4}" x2="${o.at}" y1="${y}" y2="${y}" stroke="${MUTED_INK}"/><text x="${o.at - 7}" y="${y}" dy="0.32em" text-anchor="end">${escapeHtml(format(t))}</text>`);
    }
    parts.push(`<line x1="${o.at}" x2="${o.at}" y1="${Math.min(r0, r1)}" y2="${Math.max(r0, r1)}" stroke="${MUTED_INK}"/>`);
    const mid = ((r0 + r1) / 2).toFixed(1);
    // The title sits clear of the widest tick label (its baseline 4 px beyond it), never closer to the edge than 11 px.
    const titleX = Math.max(11, Math.min(o.at - 52, o.at - 7 - widest - 4));
    parts.push(`<text transform="translate(${titleX},${mid}) rotate(-90)" text-anchor="middle" fill="${INK}" font-size="11">${escapeHtml(o.title)}</text>`);
  }
  parts.push('</g>');
  return parts.join('');
}
