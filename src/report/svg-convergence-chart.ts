import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import type { LoopRecord } from '../fit/fit-record.js';
import { svgAxis } from './svg-axis.js';
import { paddedExtent } from './padded-extent.js';
import { escapeHtml } from './escape-html.js';
import { INK, SURFACE_COLOURS, MUTED_INK } from './palette.js';
import { formatNumber } from './format-number.js';

const W = 520;
const H = 300;
const M = { top: 16, right: 124, bottom: 46, left: 70 };

/**
 * Convergence curves: the EM objective per reading at each iteration of every restart (and of the final
 * pass on all runs, dashed), the chosen restart drawn heavier. The vertical range is fitted to the
 * iterations after the first, which is usually far below the rest; lines leaving the plot are clipped.
 */
export function svgConvergenceChart(restarts: LoopRecord[], selected: number, finalPass: LoopRecord | null, idPrefix: string): string {
  const loops = restarts.map((r, k) => ({ record: r, label: `restart ${k + 1}`, chosen: k === selected, final: false }));
  if (finalPass?.history.length) loops.push({ record: finalPass, label: 'final pass', chosen: false, final: true });
  const maxLen = Math.max(2, ...loops.map((l) => l.record.history.length));
  const later = loops.flatMap((l) => (l.record.history.length > 1 ? l.record.history.slice(1) : l.record.history));
  const x = scaleLinear().domain([1, maxLen]).range([M.left, W - M.right]).nice();
  const y = scaleLinear().domain(paddedExtent(later, 0.06)).range([H - M.bottom, M.top]).nice();
  const path = line<number>()
    .x((_, i) => x(i + 1))
    .y((v) => y(v));
  const parts = [
    `<svg class="chart" xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="Convergence of the EM objective per reading, per restart">`,
    `<defs><clipPath id="${idPrefix}-clip"><rect x="${M.left}" y="${M.top}" width="${W - M.left - M.right}" height="${H - M.top - M.bottom}"/></clipPath></defs>`,
    svgAxis('bottom', x, { at: H - M.bottom, format: (v) => String(v), title: 'iteration', grid: [M.top, H - M.bottom], width: W }),
    svgAxis('left', y, { at: M.left, title: 'objective per reading', grid: [M.left, W - M.right] }),
    `<g clip-path="url(#${idPrefix}-clip)" fill="none">`,
  ];
  const order = [...loops.filter((l) => !l.chosen), ...loops.filter((l) => l.chosen)];
  for (const l of order) {
    const colour = l.final ? INK : l.chosen ? SURFACE_COLOURS[1] : SURFACE_COLOURS[0];
    const width = l.chosen ? 2.6 : l.final ? 1.6 : 1.3;
    const dash = l.final ? ' stroke-dasharray="5 3"' : '';
    const opacity = l.chosen || l.final ? 1 : 0.55;
    const h = l.record.history;
    const tip = `${l.label}${l.chosen ? ' (chosen)' : ''}: ${l.record.iterations} iterations, ${l.record.stopReason}, last objective ${formatNumber(h[h.length - 1], 'll')}`;
    parts.push(`<path d="${path(h) ?? ''}" stroke="${colour}" stroke-width="${width}" stroke-opacity="${opacity}"${dash}><title>${escapeHtml(tip)}</title></path>`);
  }
  parts.push('</g>');
  // Direct labels at the right-hand end: the chosen restart and the final pass, kept at least one line
  // apart (they often end at the same objective) and clear of the "other restarts" key at the bottom.
  const LINE = 14;
  const labels = loops
    .filter((l) => (l.chosen || l.final) && l.record.history.length > 0)
    .map((l) => ({ l, y: Math.min(H - M.bottom, Math.max(M.top, y(l.record.history[l.record.history.length - 1]))) + (l.final ? 12 : -4) }))
    .sort((a, b) => a.y - b.y);
  const lowest = H - M.bottom - 4 - LINE;
  for (let k = 1; k < labels.length; k++) labels[k].y = Math.max(labels[k].y, labels[k - 1].y + LINE);
  for (let k = labels.length - 1; k >= 0; k--) labels[k].y = Math.min(labels[k].y, k === labels.length - 1 ? lowest : labels[k + 1].y - LINE);
  for (const { l, y: yy } of labels) {
    parts.push(`<text x="${W - M.right + 6}" y="${Math.max(M.top + 8, yy).toFixed(1)}" font-size="11" fill="${INK}"${l.chosen ? ' font-weight="600"' : ''}>${escapeHtml(l.chosen ? `chosen (${l.label})` : l.label)}</text>`);
  }
  if (restarts.length > 1) {
    parts.push(`<line x1="${W - M.right + 6}" x2="${W - M.right + 22}" y1="${H - M.bottom - 4}" y2="${H - M.bottom - 4}" stroke="${SURFACE_COLOURS[0]}" stroke-opacity="0.55" stroke-width="1.3"/>`);
    parts.push(`<text x="${W - M.right + 26}" y="${H - M.bottom - 4}" dy="0.32em" font-size="10" fill="${MUTED_INK}">other restarts</text>`);
  }
  parts.push('</svg>');
  return parts.join('');
}
