import { scaleLinear } from 'd3-scale';
import { symbol, symbolCircle, symbolDiamond } from 'd3-shape';
import type { LoopRecord } from '../fit/fit-record.js';
import { svgAxis } from './svg-axis.js';
import { paddedExtent } from './padded-extent.js';
import { escapeHtml } from './escape-html.js';
import { estimateTextWidth } from './estimate-text-width.js';
import { formatNumber } from './format-number.js';
import { INK, SURFACE_COLOURS, MUTED_INK } from './palette.js';

const W = 440;
const H = 300;
const M = { top: 16, right: 20, bottom: 46, left: 70 };

interface Box {
  left: number;
  right: number;
  top: number;
  bottom: number;
}

/** Label spots around a point, in order of preference: offset of the text anchor, and the anchor. */
const SPOTS: [number, number, 'start' | 'end'][] = [
  [9, -8, 'start'],
  [-9, -8, 'end'],
  [9, 16, 'start'],
  [-9, 16, 'end'],
];

const overlaps = (a: Box, b: Box): boolean => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;

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
      width: W,
    }),
    svgAxis('left', y, { at: M.left, title: heldOut ? 'held-out log-likelihood per reading' : 'training log-likelihood per reading', grid: [M.left, W - M.right] }),
  ];
  const order = restarts.map((_, k) => k).filter((k) => k !== selected).concat(selected < restarts.length ? [selected] : []);
  // Labels are placed chosen first, then in restart order, each at the first free spot around its point;
  // a label with no free spot is left out (the point's hover text still names it).
  const placed: Box[] = restarts.map((_, k) => ({ left: x(xs[k]) - 6, right: x(xs[k]) + 6, top: y(ys[k]) - 6, bottom: y(ys[k]) + 6 }));
  const labels = new Map<number, string>();
  for (const k of [selected, ...order.filter((k) => k !== selected)]) {
    if (k >= restarts.length) continue;
    const chosen = k === selected;
    const text = chosen ? `${k + 1} · chosen` : String(k + 1);
    const size = chosen ? 11 : 10;
    const w = estimateTextWidth(text, size, chosen);
    const px = x(xs[k]);
    const py = y(ys[k]);
    for (const [dx, dy, anchor] of SPOTS) {
      const left = anchor === 'start' ? px + dx : px + dx - w;
      const box: Box = { left, right: left + w, top: py + dy - size, bottom: py + dy + 2 };
      if (box.left < 1 || box.right > W - 1 || box.top < 1 || box.bottom > H - M.bottom) continue;
      if (placed.some((b) => overlaps(b, box))) continue;
      placed.push(box);
      labels.set(k, `<text x="${dx}" y="${dy}" text-anchor="${anchor}" font-size="${size}" fill="${chosen ? INK : MUTED_INK}"${chosen ? ' font-weight="600"' : ''}>${text}</text>`);
      break;
    }
  }
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
        `${labels.get(k) ?? ''}</g>`,
    );
  }
  parts.push('</svg>');
  return parts.join('');
}
