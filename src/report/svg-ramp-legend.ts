import { scaleLinear, scaleSqrt } from 'd3-scale';
import { escapeHtml } from './escape-html.js';
import { estimateTextWidth } from './estimate-text-width.js';
import { MUTED_INK, RAMP_STOPS, INK } from './palette.js';

export interface RampLegendOptions {
  /** Plain-text title above the bar. */
  title: string;
  /** Value domain [low, high] the ramp spans. */
  domain: [number, number];
  /** Tick label format. */
  format: (v: number) => string;
  /** Square-root spacing (for skewed shares); linear otherwise. */
  sqrt?: boolean;
  /** Dark at the low end (for values where less is better, e.g. an error). */
  reverse?: boolean;
  /** Unique id prefix for the gradient. */
  idPrefix: string;
  width?: number;
}

/**
 * A horizontal colour bar of the report's sequential ramp with ticks from a d3 scale (nice round values,
 * spaced as the data are mapped: linear or square root).
 */
export function svgRampLegend(o: RampLegendOptions): string {
  const barX = 16;
  // Wide enough for the title: a legend must never clip its own caption.
  const width = Math.max(o.width ?? 260, barX + estimateTextWidth(o.title, 11, true) + 8);
  const barW = width - 32;
  const scale = (o.sqrt ? scaleSqrt() : scaleLinear()).domain(o.domain).range([barX, barX + barW]);
  // Candidate ticks from the scale, thinned so labels stay at least 40 px apart (a sqrt scale crowds them at the top).
  const ticks: number[] = [];
  for (const t of scale.ticks(10)) {
    if (t < o.domain[0] || t > o.domain[1]) continue;
    if (ticks.length === 0 || scale(t) - scale(ticks[ticks.length - 1]) >= 40) ticks.push(t);
  }
  const colours = o.reverse ? [...RAMP_STOPS].reverse() : RAMP_STOPS;
  const stops = colours.map((c, k) => `<stop offset="${((100 * k) / (colours.length - 1)).toFixed(1)}%" stop-color="${c}"/>`).join('');
  // The gradient runs evenly in colour; a sqrt legend places ticks where their colour falls.
  const tickMarks = ticks
    .map((t) => {
      const x = scale(t).toFixed(1);
      return `<line x1="${x}" x2="${x}" y1="30" y2="35" stroke="${MUTED_INK}"/><text x="${x}" y="46" text-anchor="middle">${escapeHtml(o.format(t))}</text>`;
    })
    .join('');
  return (
    `<svg class="ramp-legend" xmlns="http://www.w3.org/2000/svg" width="${width}" height="52" viewBox="0 0 ${width} 52" role="img" aria-label="${escapeHtml(o.title)}">` +
    `<defs><linearGradient id="${o.idPrefix}-ramp">${stops}</linearGradient></defs>` +
    `<text x="${barX}" y="11" fill="${INK}" font-size="11" font-weight="600">${escapeHtml(o.title)}</text>` +
    `<rect x="${barX}" y="17" width="${barW}" height="13" fill="url(#${o.idPrefix}-ramp)" stroke="${MUTED_INK}" stroke-width="0.5"/>` +
    `<g font-size="10" fill="${MUTED_INK}">${tickMarks}</g></svg>`
  );
}
