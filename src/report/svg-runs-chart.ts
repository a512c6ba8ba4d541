import { scaleLinear } from 'd3-scale';
import { symbol, symbolCircle, symbolDiamond, symbolSquare } from 'd3-shape';
import type { RunRow } from './report-data.js';
import { svgAxis } from './svg-axis.js';
import { paddedExtent } from './padded-extent.js';
import { escapeHtml } from './escape-html.js';
import { formatNumber } from './format-number.js';
import { INK, SURFACE_COLOURS } from './palette.js';
import { lowConfidenceShare } from './low-confidence-share.js';

const W = 600;
const H = 320;
const M = { top: 16, right: 24, bottom: 46, left: 70 };
const LABEL_GAP = 12;

/** Marks of the splits: shape and colour differ, so the split reads without colour too. */
export const SPLIT_MARKS: Record<string, { colour: string; shape: 'circle' | 'diamond' | 'square'; label: string }> = {
  fit: { colour: SURFACE_COLOURS[0], shape: 'circle', label: 'fitted on' },
  'held-out': { colour: SURFACE_COLOURS[1], shape: 'diamond', label: 'held out' },
  other: { colour: SURFACE_COLOURS[5], shape: 'square', label: 'not in the fit' },
};

/**
 * Every run as a point: log-likelihood per reading (left = readings the model found unlikely) against the
 * share of low-confidence steps (up = decoding unsure); shape and colour by split, mark area growing with
 * the run's surprising steps. The `labelled` runs (the worst ones) carry their ids, nudged apart so they
 * do not overprint.
 */
export function svgRunsChart(rows: RunRow[], labelled: Set<string>): string {
  const pts = rows.filter((r) => Number.isFinite(r.loglikPerReading) && Number.isFinite(lowConfidenceShare(r)));
  const x = scaleLinear().domain(paddedExtent(pts.map((r) => r.loglikPerReading))).range([M.left, W - M.right]).nice();
  const [lo, hi] = paddedExtent(pts.map(lowConfidenceShare));
  const y = scaleLinear().domain([Math.max(0, lo), Math.min(1, hi)]).range([H - M.bottom, M.top]).nice();
  const parts = [
    `<svg class="chart" xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="Runs: log-likelihood per reading against share of low-confidence steps">`,
    svgAxis('bottom', x, { at: H - M.bottom, title: 'log-likelihood per reading (higher is better)', grid: [M.top, H - M.bottom], width: W }),
    svgAxis('left', y, { at: M.left, format: y.tickFormat(5, '.0%'), title: 'low-confidence steps', grid: [M.left, W - M.right] }),
  ];
  const shapes = { circle: symbolCircle, diamond: symbolDiamond, square: symbolSquare };
  // Fewest surprising steps drawn last, so large marks do not hide small ones.
  const order = [...pts].sort((a, b) => b.surprisingSteps - a.surprisingSteps);
  for (const r of order) {
    const mark = SPLIT_MARKS[r.split] ?? SPLIT_MARKS.other;
    const area = 40 + 14 * Math.min(r.surprisingSteps, 30);
    const d = symbol(shapes[mark.shape], mark.shape === 'diamond' ? area * 1.2 : area)() as string;
    const tip = `${r.run} (${r.split || 'split unknown'}): log-likelihood per reading ${formatNumber(r.loglikPerReading, 'll')}, low-confidence ${formatNumber(lowConfidenceShare(r), 'pct')}, ${r.surprisingSteps} surprising steps, ${r.steps} steps`;
    parts.push(
      `<path transform="translate(${x(r.loglikPerReading).toFixed(1)},${y(lowConfidenceShare(r)).toFixed(1)})" d="${d}" fill="${mark.colour}" fill-opacity="0.8" stroke="#ffffff" stroke-width="0.8"><title>${escapeHtml(tip)}</title></path>`,
    );
  }
  // Labels: above-right of their point (left of it in the right half), pushed down to keep 12 px apart.
  const labels = pts
    .filter((r) => labelled.has(r.run))
    .map((r) => ({ r, px: x(r.loglikPerReading), py: y(lowConfidenceShare(r)) - 8 }))
    .sort((a, b) => a.py - b.py);
  for (let k = 1; k < labels.length; k++) labels[k].py = Math.max(labels[k].py, labels[k - 1].py + LABEL_GAP);
  for (const { r, px, py } of labels) {
    const text = r.run.length > 22 ? `${r.run.slice(0, 21)}…` : r.run;
    const end = px > W / 2;
    parts.push(`<text x="${(px + (end ? -8 : 8)).toFixed(1)}" y="${Math.max(M.top + 8, py).toFixed(1)}" font-size="10.5" fill="${INK}" text-anchor="${end ? 'end' : 'start'}">${escapeHtml(text)}</text>`);
  }
  parts.push('</svg>');
  return parts.join('');
}
