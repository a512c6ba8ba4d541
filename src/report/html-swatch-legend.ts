import { escapeHtml } from './escape-html.js';

export interface Swatch {
  /** CSS colour of the swatch. */
  colour: string;
  /** Plain text. */
  label: string;
  /** Extra look of the swatch (hatching, outlines, or a small glyph drawn in `colour`); a plain square when absent. */
  mark?: 'hatch' | 'dashed' | 'light-hatch' | 'arrow' | 'dot' | 'line' | 'notch' | 'outline' | 'triangle' | 'diamond';
}

/** A legend of colour swatches with labels (HTML, wraps with the page). */
export function htmlSwatchLegend(swatches: Swatch[], caption = ''): string {
  const items = swatches
    .map((s) => `<span class="swatch-item"><span class="swatch${s.mark ? ` swatch-${s.mark}` : ''}" style="--swatch:${s.colour}"></span>${escapeHtml(s.label)}</span>`)
    .join('');
  return `<div class="swatch-legend">${caption ? `<span class="legend-caption">${escapeHtml(caption)}</span>` : ''}${items}</div>`;
}
