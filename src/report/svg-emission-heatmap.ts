import type { HmmModel } from '../model/hmm-model.js';
import { escapeHtml } from './escape-html.js';
import { orderBySurvey } from './order-by-survey.js';
import { findDisagreements } from './find-disagreements.js';
import { INK, MUTED_INK, rampColour, surfaceColour } from './palette.js';
import { formatNumber } from './format-number.js';

const LEFT = 92;
const TOP = 8;
const ROW = 20;
const TARGET_WIDTH = 860;

/**
 * The emission table as a heat map: one column per cell, grouped by surveyed surface (see
 * `orderBySurvey`), one row per reading, colour = P(reading | cell) on the sequential ramp. In each group
 * the row of the surveyed surface is outlined (what the survey expects the cells to read); a triangle
 * under a column marks a cell whose most likely reading is not its surveyed surface.
 */
export function svgEmissionHeatmap(model: HmmModel): string {
  const m = model.surfaces.length;
  const order = orderBySurvey(model);
  const n = order.length;
  const cw = Math.min(14, Math.max(1, TARGET_WIDTH / n));
  const plotW = cw * n;
  const plotH = ROW * m;
  const width = LEFT + plotW + 12;
  const height = TOP + plotH + 58;
  const surfaceIndex = new Map(model.surfaces.map((s, r) => [s, r] as const));
  const f = (v: number): string => (Math.round(v * 100) / 100).toString();
  const parts = [
    `<svg class="chart heatmap" xmlns="http://www.w3.org/2000/svg" width="${f(width)}" height="${f(height)}" viewBox="0 0 ${f(width)} ${f(height)}" role="img" aria-label="Emission table: probability of each reading in each cell, cells grouped by surveyed surface">`,
  ];
  // Row labels (readings).
  parts.push(`<g font-size="11" fill="${INK}" text-anchor="end">`);
  model.surfaces.forEach((s, r) => parts.push(`<text x="${LEFT - 8}" y="${f(TOP + r * ROW + ROW / 2)}" dy="0.32em">${escapeHtml(s)}</text>`));
  parts.push('</g>');
  // Cells.
  order.forEach((i, col) => {
    const cell = model.cells[i];
    const x = LEFT + col * cw;
    const row = model.emission.subarray(i * m, (i + 1) * m);
    const tip = `${cell.id} (surveyed ${cell.surface}): ${model.surfaces.map((s, r) => `${s} ${formatNumber(row[r], 'p')}`).join(', ')}`;
    parts.push(`<g><title>${escapeHtml(tip)}</title>`);
    for (let r = 0; r < m; r++) parts.push(`<rect x="${f(x)}" y="${TOP + r * ROW}" width="${f(cw + 0.05)}" height="${ROW}" fill="${rampColour(row[r])}"/>`);
    parts.push('</g>');
  });
  // Groups: outline the surveyed row, label the group underneath.
  let start = 0;
  while (start < n) {
    const surveyed = surfaceIndex.get(model.cells[order[start]].surface) ?? 0;
    let end = start;
    while (end < n && (surfaceIndex.get(model.cells[order[end]].surface) ?? 0) === surveyed) end++;
    const x0 = LEFT + start * cw;
    const w = (end - start) * cw;
    parts.push(`<rect class="expected" x="${f(x0)}" y="${TOP + surveyed * ROW}" width="${f(w)}" height="${ROW}" fill="none" stroke="${INK}" stroke-width="1.6"/>`);
    parts.push(`<rect x="${f(x0)}" y="${TOP + plotH + 14}" width="${f(w)}" height="5" fill="${surfaceColour(surveyed)}"/>`);
    if (w >= 26) {
      parts.push(`<text x="${f(x0 + w / 2)}" y="${TOP + plotH + 32}" font-size="10" text-anchor="middle" fill="${INK}">${escapeHtml(model.surfaces[surveyed])}</text>`);
      parts.push(`<text x="${f(x0 + w / 2)}" y="${TOP + plotH + 44}" font-size="9" text-anchor="middle" fill="${MUTED_INK}">${end - start} cells</text>`);
    }
    if (start > 0) parts.push(`<line x1="${f(x0)}" x2="${f(x0)}" y1="${TOP}" y2="${TOP + plotH}" stroke="#ffffff" stroke-width="1"/>`);
    start = end;
  }
  // Cells whose most likely reading disagrees with the survey.
  const tri = Math.max(3, Math.min(5, cw));
  const column = new Map(order.map((i, col) => [i, col] as const));
  for (const d of findDisagreements(model)) {
    const cx = LEFT + (column.get(d.cell) as number) * cw + cw / 2;
    const y0 = TOP + plotH + 2;
    const tip = `${model.cells[d.cell].id}: most likely reading ${model.surfaces[d.likely]} (${formatNumber(d.likelyP, 'p')}), surveyed ${model.cells[d.cell].surface} (${formatNumber(d.surveyedP, 'p')})`;
    parts.push(`<path class="disagrees" d="M${f(cx)},${f(y0)}L${f(cx + tri)},${f(y0 + tri * 1.6)}L${f(cx - tri)},${f(y0 + tri * 1.6)}z" fill="${INK}"><title>${escapeHtml(tip)}</title></path>`);
  }
  parts.push('</svg>');
  return parts.join('');
}
