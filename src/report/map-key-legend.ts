import type { HmmModel } from '../model/hmm-model.js';
import type { FloorGeometry } from './floor-geometry.js';
import { htmlSwatchLegend, type Swatch } from './html-swatch-legend.js';
import { INK } from './palette.js';

/** The legend of what every floor map draws besides the cell colours: links, one-way arrows, level links, start cells. */
export function mapKeyLegend(model: HmmModel, geometry: FloorGeometry): string {
  const swatches: Swatch[] = [{ colour: '#9ea6ad', label: 'two-way link', mark: 'line' }];
  if (geometry.links.some((l) => l.oneway)) swatches.push({ colour: INK, label: 'one-way link (arrow shows the direction)', mark: 'arrow' });
  if (geometry.crossLinks.length) swatches.push({ colour: INK, label: 'link to another level (hover for where)', mark: 'dot' });
  const nStart = model.start.reduce((a, p) => a + (p > 0 ? 1 : 0), 0);
  if (nStart < model.cells.length) swatches.push({ colour: INK, label: 'runs may start here', mark: 'notch' });
  if (model.cells.some((c) => c.zone !== undefined)) swatches.push({ colour: INK, label: 'zone border (zone names at their centres)', mark: 'outline' });
  return htmlSwatchLegend(swatches);
}
