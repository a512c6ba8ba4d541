import { scaleLinear, scaleSqrt } from 'd3-scale';
import type { ReliabilityBin } from '../fit/predictive-calibration.js';
import { svgAxis } from './svg-axis.js';
import { escapeHtml } from './escape-html.js';
import { formatNumber } from './format-number.js';
import { INK, MUTED_INK, SURFACE_COLOURS } from './palette.js';

const W = 360;
const H = 300;
const M = { top: 16, right: 20, bottom: 46, left: 58 };

/**
 * Reliability diagram: mean forecast probability (x) against the share of forecasts that came true (y),
 * one circle per non-empty bin (area ∝ forecasts), joined in bin order, and the diagonal a calibrated
 * forecaster would follow.
 */
export function svgReliabilityChart(bins: ReliabilityBin[]): string {
  const x = scaleLinear().domain([0, 1]).range([M.left, W - M.right]);
  const y = scaleLinear().domain([0, 1]).range([H - M.bottom, M.top]);
  const filled = bins.filter((b) => b.count > 0);
  const maxCount = Math.max(1, ...filled.map((b) => b.count));
  const r = scaleSqrt().domain([0, maxCount]).range([0, 11]);
  const parts = [
    `<svg class="chart" xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="Reliability of the one-step-ahead reading forecasts">`,
    svgAxis('bottom', x, { at: H - M.bottom, title: 'forecast probability of the most likely next reading', ticks: 5, grid: [M.top, H - M.bottom] }),
    svgAxis('left', y, { at: M.left, title: 'share that came true', ticks: 5, grid: [M.left, W - M.right] }),
    `<line class="diagonal" x1="${x(0)}" y1="${y(0)}" x2="${x(1)}" y2="${y(1)}" stroke="${MUTED_INK}" stroke-dasharray="4 3" stroke-width="1"/>`,
  ];
  if (filled.length > 1) {
    const pts = filled.map((b) => `${x(b.meanPredicted!).toFixed(1)},${y(b.observed!).toFixed(1)}`).join(' ');
    parts.push(`<polyline points="${pts}" fill="none" stroke="${SURFACE_COLOURS[0]}" stroke-width="1.5"/>`);
  }
  for (const b of filled) {
    const tip = `forecasts ${formatNumber(b.lower, 'g')}–${formatNumber(b.upper, 'g')}: ${formatNumber(b.count, 'int')} forecasts, mean ${formatNumber(b.meanPredicted, 'p')}, came true ${formatNumber(b.observed, 'p')}`;
    parts.push(
      `<circle class="reliability-bin" cx="${x(b.meanPredicted!).toFixed(1)}" cy="${y(b.observed!).toFixed(1)}" r="${Math.max(2.5, r(b.count)).toFixed(1)}" fill="${SURFACE_COLOURS[0]}" fill-opacity="0.85" stroke="${INK}" stroke-width="0.8"><title>${escapeHtml(tip)}</title></circle>`,
    );
  }
  parts.push('</svg>');
  return parts.join('');
}
