import type { FloorGeometry } from './floor-geometry.js';

/**
 * Pixels per metre for the floor maps: the widest level fills about `width` pixels, never more than
 * `max` per metre (small floors stay small) nor fewer than 3 (huge floors stay legible when zoomed).
 */
export function mapScale(geometry: FloorGeometry, width = 500, max = 30): number {
  let widest = geometry.pitch;
  for (const l of geometry.levels) widest = Math.max(widest, l.maxX - l.minX + geometry.pitch, (l.maxY - l.minY + geometry.pitch) * 0.8);
  return Math.max(3, Math.min(max, width / widest));
}
