import type { HmmModel } from '../model/hmm-model.js';
import type { FloorGeometry, LevelGeometry } from './floor-geometry.js';
import { escapeHtml } from './escape-html.js';
import { INK, MUTED_INK } from './palette.js';
import { svgZoneOutlines } from './svg-zone-outlines.js';

/** One way of colouring the cells (an overlay). */
export interface MapLayer {
  /** Short CSS-safe key (letters, digits, dashes): the layer's class is `layer-<key>`. */
  key: string;
  fill(cell: number): string;
  /** Hatching over a cell's fill: dark (e.g. ambiguous cells), light (surfaces past the eighth colour), or none. */
  hatch?(cell: number): 'dark' | 'light' | false;
  /** Cells with no value: drawn with a dashed outline. */
  noData?(cell: number): boolean;
  /** Hover text of a cell (plain text; escaped here). */
  title(cell: number): string;
}

export interface FloorMapOptions {
  /** Pixels per metre. */
  pxPerM: number;
  /** Prefix of the SVG's internal ids (patterns, markers); unique within the page. */
  idPrefix: string;
  /** Accessible name of the map (plain text). */
  label: string;
}

const MARGIN = 12;
const SCALE_BAR_SPACE = 22;
/** Cell squares cover this share of the grid pitch, leaving gaps in which links show. */
const CELL_SHARE = 0.66;

/**
 * One level of the floor as an SVG: cells as squares at their coordinates (north up), two-way links as
 * lines between neighbouring centres (seen in the gaps between squares), one-way links as arrows drawn
 * over the cells, links to other levels as a dot in the cell's corner, start cells with a notch, and a
 * scale bar; zones outlined and named over every layer (`svgZoneOutlines`). Each layer is a `<g class="layer layer-<key>">` of cell squares, so the page can switch
 * overlays with CSS alone.
 */
export function svgFloorMap(model: HmmModel, geometry: FloorGeometry, level: LevelGeometry, layers: MapLayer[], options: FloorMapOptions): string {
  const { pxPerM: s, idPrefix } = options;
  const pitch = geometry.pitch;
  const cells = model.cells;
  const px = (i: number): number => MARGIN + (cells[i].x - level.minX + pitch / 2) * s;
  const py = (i: number): number => MARGIN + (level.maxY - cells[i].y + pitch / 2) * s;
  const width = (level.maxX - level.minX + pitch) * s + 2 * MARGIN;
  const mapHeight = (level.maxY - level.minY + pitch) * s + 2 * MARGIN;
  const height = mapHeight + SCALE_BAR_SPACE;
  const side = pitch * s * CELL_SHARE;
  const half = side / 2;
  const onLevel = new Set(level.cells);
  const r = (v: number): string => (Math.round(v * 10) / 10).toString();
  const parts: string[] = [];
  parts.push(
    `<svg class="floor-map" xmlns="http://www.w3.org/2000/svg" width="${r(width)}" height="${r(height)}" viewBox="0 0 ${r(width)} ${r(height)}" role="img" aria-label="${escapeHtml(options.label)}">`,
    '<defs>',
    `<pattern id="${idPrefix}-hatch" patternUnits="userSpaceOnUse" width="4" height="4" patternTransform="rotate(45)"><rect width="1.3" height="4" fill="${INK}" fill-opacity="0.5"/></pattern>`,
    `<pattern id="${idPrefix}-light-hatch" patternUnits="userSpaceOnUse" width="4" height="4" patternTransform="rotate(-45)"><rect width="1.5" height="4" fill="#ffffff" fill-opacity="0.75"/></pattern>`,
    `<marker id="${idPrefix}-arrow" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="5" markerHeight="5" orient="auto-start-reverse"><path d="M0,0L10,5L0,10z" fill="${INK}"/></marker>`,
    '</defs>',
  );
  // Two-way links under the cells: one path.
  const twoWay: string[] = [];
  for (const link of geometry.links) {
    if (link.oneway || !onLevel.has(link.from)) continue;
    twoWay.push(`M${r(px(link.from))},${r(py(link.from))}L${r(px(link.to))},${r(py(link.to))}`);
  }
  if (twoWay.length) parts.push(`<path class="links" d="${twoWay.join('')}" stroke="#9ea6ad" stroke-width="${r(Math.max(1.2, side * 0.16))}" stroke-linecap="round" fill="none"/>`);
  for (const layer of layers) {
    parts.push(`<g class="layer layer-${layer.key}">`);
    for (const i of level.cells) {
      const x = px(i) - half;
      const y = py(i) - half;
      const noData = layer.noData?.(i) ?? false;
      const stroke = noData ? ` stroke="${MUTED_INK}" stroke-width="0.8" stroke-dasharray="2 1.5"` : '';
      parts.push(`<rect x="${r(x)}" y="${r(y)}" width="${r(side)}" height="${r(side)}" rx="1.5" fill="${layer.fill(i)}"${stroke}><title>${escapeHtml(layer.title(i))}</title></rect>`);
      const hatch = layer.hatch?.(i) ?? false;
      if (hatch) {
        const pattern = hatch === 'dark' ? `${idPrefix}-hatch` : `${idPrefix}-light-hatch`;
        parts.push(`<rect x="${r(x)}" y="${r(y)}" width="${r(side)}" height="${r(side)}" rx="1.5" fill="url(#${pattern})" pointer-events="none"/>`);
      }
    }
    parts.push('</g>');
  }
  parts.push(svgZoneOutlines(model, level, { px, py, pxPerM: s, pitch, width }));
  // Start cells: a small notch in the lower-left corner (only when runs may not start anywhere).
  const nStart = model.start.reduce((a, p) => a + (p > 0 ? 1 : 0), 0);
  if (nStart < cells.length) {
    const notch = Math.max(4, side * 0.5);
    for (const i of level.cells) {
      if (model.start[i] <= 0) continue;
      const x = px(i) - half;
      const y = py(i) + half;
      parts.push(`<path class="start" d="M${r(x)},${r(y - notch)}L${r(x)},${r(y)}L${r(x + notch)},${r(y)}z" fill="${INK}" stroke="#ffffff" stroke-width="0.8"><title>${escapeHtml(`${cells[i].id}: runs may start here`)}</title></path>`);
    }
  }
  // One-way links: arrows from the edge of one square to the edge of the other, over the cells.
  for (const link of geometry.links) {
    if (!link.oneway || !onLevel.has(link.from)) continue;
    const x1 = px(link.from);
    const y1 = py(link.from);
    const x2 = px(link.to);
    const y2 = py(link.to);
    const len = Math.hypot(x2 - x1, y2 - y1);
    if (len === 0) continue;
    const ux = (x2 - x1) / len;
    const uy = (y2 - y1) / len;
    const exit = half / Math.max(Math.abs(ux), Math.abs(uy));
    const a = Math.min(exit * 0.55, len / 3);
    const b = Math.max(len - exit * 0.55, len * 2 / 3);
    parts.push(
      `<line class="oneway" x1="${r(x1 + ux * a)}" y1="${r(y1 + uy * a)}" x2="${r(x1 + ux * b)}" y2="${r(y1 + uy * b)}" stroke="${INK}" stroke-width="2" marker-end="url(#${idPrefix}-arrow)"><title>${escapeHtml(`one-way link: ${cells[link.from].id} → ${cells[link.to].id}`)}</title></line>`,
    );
  }
  // Links to other levels: a ringed dot in the cell's upper-right corner.
  const crossByCell = new Map<number, string[]>();
  for (const link of geometry.crossLinks) {
    for (const [here, there] of [[link.from, link.to], [link.to, link.from]] as const) {
      if (!onLevel.has(here)) continue;
      const arrow = link.oneway ? (here === link.from ? '→' : '←') : '↔';
      const list = crossByCell.get(here) ?? [];
      list.push(`${arrow} ${cells[there].id} (level ${cells[there].level})`);
      crossByCell.set(here, list);
    }
  }
  for (const [i, targets] of crossByCell) {
    const dot = Math.max(2.5, side * 0.18);
    parts.push(
      `<circle class="cross-level" cx="${r(px(i) + half - dot)}" cy="${r(py(i) - half + dot)}" r="${r(dot)}" fill="${INK}" stroke="#ffffff" stroke-width="1.2"><title>${escapeHtml(`${cells[i].id}: link to another level ${targets.join(', ')}`)}</title></circle>`,
    );
  }
  parts.push(scaleBar(s, MARGIN, mapHeight + 6, width));
  parts.push('</svg>');
  return parts.join('');
}

/** A scale bar of a round length (1, 2 or 5 × 10^k metres) about a fifth of the map wide. */
function scaleBar(pxPerM: number, x: number, y: number, width: number): string {
  const target = (width - 2 * MARGIN) / 5 / pxPerM;
  const exp = Math.floor(Math.log10(Math.max(target, 1e-9)));
  let metres = 10 ** exp;
  for (const k of [2, 5, 10]) if (k * 10 ** exp <= target) metres = k * 10 ** exp;
  const len = metres * pxPerM;
  const label = `${Number(metres.toPrecision(3))} m`;
  return (
    `<g class="scale-bar" fill="${MUTED_INK}" font-size="10">` +
    `<path d="M${x},${y}v6h${len.toFixed(1)}v-6" fill="none" stroke="${MUTED_INK}" stroke-width="1.2"/>` +
    `<text x="${(x + len + 5).toFixed(1)}" y="${y + 8}">${label}</text></g>`
  );
}
