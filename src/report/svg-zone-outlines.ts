import type { HmmModel } from '../model/hmm-model.js';
import type { LevelGeometry } from './floor-geometry.js';
import { escapeHtml } from './escape-html.js';
import { INK } from './palette.js';

/** Placement of one level's map, as `svgFloorMap` draws it. */
export interface MapFrame {
  /** SVG x / y of cell i's centre. */
  px(i: number): number;
  py(i: number): number;
  /** Pixels per metre. */
  pxPerM: number;
  /** Grid pitch, metres. */
  pitch: number;
  /** Width of the map, pixels (names are kept inside it). */
  width: number;
}

/**
 * Zone outlines and names on one level's map: every side of a zoned cell's pitch square whose
 * neighbour across it (the cell one pitch away on the same level, found on the rounded grid) is missing
 * or in another zone is drawn, so each zone is outlined along its border; cells without a zone get no
 * outline. Each zone's name sits at the centroid of its cells on this level, with a halo so it reads
 * over any fill, in a smaller type when the zone is narrower than its name, and kept inside the map. Names are input text: escaped. Empty when no cell of the level has a zone.
 */
export function svgZoneOutlines(model: HmmModel, level: LevelGeometry, frame: MapFrame): string {
  const cells = model.cells;
  const zoned = level.cells.filter((i) => cells[i].zone !== undefined);
  if (zoned.length === 0) return '';
  const { pitch, pxPerM: s } = frame;
  const grid = (v: number, origin: number): number => Math.round((v - origin) / pitch);
  const at = new Map<string, number>();
  for (const i of level.cells) at.set(`${grid(cells[i].x, level.minX)},${grid(cells[i].y, level.minY)}`, i);
  const r = (v: number): string => (Math.round(v * 10) / 10).toString();
  const half = (pitch * s) / 2;
  const edges: string[] = [];
  for (const i of zoned) {
    const gx = grid(cells[i].x, level.minX);
    const gy = grid(cells[i].y, level.minY);
    const x = frame.px(i);
    const y = frame.py(i);
    const differs = (dx: number, dy: number): boolean => {
      const j = at.get(`${gx + dx},${gy + dy}`);
      return j === undefined || cells[j].zone !== cells[i].zone;
    };
    // North is up: +y on the floor is −y on the page.
    if (differs(0, 1)) edges.push(`M${r(x - half)},${r(y - half)}h${r(2 * half)}`);
    if (differs(0, -1)) edges.push(`M${r(x - half)},${r(y + half)}h${r(2 * half)}`);
    if (differs(-1, 0)) edges.push(`M${r(x - half)},${r(y - half)}v${r(2 * half)}`);
    if (differs(1, 0)) edges.push(`M${r(x + half)},${r(y - half)}v${r(2 * half)}`);
  }
  const byZone = new Map<string, number[]>();
  for (const i of zoned) {
    const z = cells[i].zone as string;
    const list = byZone.get(z);
    if (list) list.push(i);
    else byZone.set(z, [i]);
  }
  const fontSize = Math.max(8, Math.min(11, pitch * s * 0.42));
  const labels = [...byZone].map(([zone, members]) => {
    const xs = members.map((i) => frame.px(i));
    const zoneWidth = Math.max(...xs) - Math.min(...xs) + 2 * half;
    // Width of a name is about 0.6 em per character in the system sans-serif fonts.
    const size = Math.max(7, Math.min(fontSize, (zoneWidth * 1.15) / (0.6 * Math.max(1, zone.length))));
    const textHalf = (0.6 * size * zone.length) / 2;
    const centre = xs.reduce((a, x) => a + x, 0) / members.length;
    const cx = Math.max(textHalf + 2, Math.min(frame.width - textHalf - 2, centre));
    const cy = members.reduce((a, i) => a + frame.py(i), 0) / members.length;
    const sized = size === fontSize ? '' : ` font-size="${r(size)}"`;
    return `<text x="${r(cx)}" y="${r(cy)}"${sized}>${escapeHtml(zone)}</text>`;
  });
  return (
    `<g class="zones" pointer-events="none"><path class="zone-outline" d="${edges.join('')}" fill="none" stroke="${INK}" stroke-width="1.6" stroke-linecap="square"/></g>` +
    `<g class="zone-names" pointer-events="none" font-size="${r(fontSize)}" font-weight="600" text-anchor="middle" dominant-baseline="central" fill="${INK}" stroke="#ffffff" stroke-width="2.6" stroke-linejoin="round" paint-order="stroke">${labels.join('')}</g>`
  );
}
