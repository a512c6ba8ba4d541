import { scaleLinear } from 'd3-scale';
import { symbol, symbolCircle, symbolDiamond } from 'd3-shape';
import type { LoopRecord } from '../fit/fit-record.js';
import { svgAxis } from './svg-axis.js';
import { paddedExtent } from './padded-extent.js';
import { escapeHtml } from './escape-html.js';
import { formatNumber } from './format-number.js';
import { INK, SURFACE_COLOURS, MUTED_INK } from './palette.js';

const W = 440;
const H = 300;
const M = { top: 16, right: 20, bottom: 46, left: 70 };

/**
 * Training against held-out log-likelihood per reading, one point per restart, the chosen restart drawn
 * as a large diamond with a label. Without held-out runs, training log-likelihood per restart number.
 */
export function svgRestartsChart(restarts: LoopRecord[], selected: number): string {
  const heldOut = restarts.every((r) => r.heldOutLogLikPerReading !== null);
  const xs = restarts.map((r, k) => (heldOut ? r.trainLogLikPerReading : k + 1));
  const ys = restarts.map((r) => (heldOut ? (r.heldOutLogLikPerReading as number) : r.trainLogLikPerReading));
  const x = scaleLinear().domain(heldOut ? paddedExtent(xs) : [0.5, restarts.length + 0.5]).range([M.left, W - M.right]);
  const y = scaleLinear().domain(paddedExtent(ys)).range([H - M.bottom, M.top]);
  if (heldOut) x.nice();
  y.nice();
  const parts = [
    `<svg class="chart" xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="Restarts: training and held-out log-likelihood per reading">`,
    svgAxis('bottom', x, {
      at: H - M.bottom,
      format: heldOut ? undefined : (v) => (Number.isInteger(v) ? String(v) : ''),
      title: heldOut ? 'training log-likelihood per reading' : 'restart',
      ticks: heldOut ? 5 : restarts.length,
      grid: [M.top, H - M.bottom],
    }),
    svgAxis('left', y, { at: M.left, title: heldOut ? 'held-out log-likelihood per reading' : 'training log-likelihood per reading', grid: [M.left, W - M.right] }),
  ];
  const order = restarts.map((_, k) => k).filter((k) => k !== selected).concat(selected < restarts.length ? [selected] : []);
  for (const k of order) {
    const chosen = k === selected;
    const r = restarts[k];
    const cx = x(xs[k]).toFixed(1);
    const cy = y(ys[k]).toFixed(1);
    const path = symbol(chosen ? symbolDiamond : symbolCircle, chosen ? 190 : 70)() as string;
    const tip = `restart ${k + 1}${r.mode ? ` (${r.mode})` : ''}${chosen ? ' (chosen)' : ''}: seed ${r.seed}, ${r.iterations} iterations, ${r.stopReason}; training ${formatNumber(r.trainLogLikPerReading, 'll')}, held-out ${formatNumber(r.heldOutLogLikPerReading, 'll')}`;
    parts.push(
      `<g class="restart-point${chosen ? ' chosen' : ''}" transform="translate(${cx},${cy})">` +
        `<path d="${path}" fill="${chosen ? SURFACE_COLOURS[1] : SURFACE_COLOURS[0]}" fill-opacity="${chosen ? 1 : 0.8}" stroke="${chosen ? INK : '#ffffff'}" stroke-width="${chosen ? 1.6 : 1}"><title>${escapeHtml(tip)}</title></path>` +
        `<text x="${x(xs[k]) > W - 100 ? -9 : 9}" y="-8" text-anchor="${x(xs[k]) > W - 100 ? 'end' : 'start'}" font-size="${chosen ? 11 : 10}" fill="${chosen ? INK : MUTED_INK}"${chosen ? ' font-weight="600"' : ''}>${chosen ? `${k + 1} · chosen` : String(k + 1)}</text></g>`,
    );
  }
  parts.push('</svg>');
  return parts.join('');
}
