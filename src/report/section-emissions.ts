import type { ReportData } from './report-data.js';
import { svgEmissionHeatmap } from './svg-emission-heatmap.js';
import { svgRampLegend } from './svg-ramp-legend.js';
import { htmlSwatchLegend } from './html-swatch-legend.js';
import { htmlTable } from './html-table.js';
import { formatNumber } from './format-number.js';
import { INK, surfaceColour } from './palette.js';

const MAX_LISTED = 40;

/** Section 4: the emission table as a heat map, and the cells that read unlike their survey. */
export function sectionEmissions(d: ReportData): string {
  const { model } = d.modelFile;
  const list = d.disagreements;
  const table = list.length
    ? '<h3>Cells that read unlike their survey</h3>' +
      `<p>${list.length} cell${list.length === 1 ? '' : 's'} most often read${list.length === 1 ? 's' : ''} something other than the surveyed surface: worn or replaced flooring, a rug, a survey error, or a surface the sensor confuses with another. Largest disagreement first.</p>` +
      htmlTable(
        [
          { header: 'cell', text: (x) => model.cells[x.cell].id },
          { header: 'level', text: (x) => String(model.cells[x.cell].level), numeric: true },
          { header: 'surveyed', text: (x) => model.cells[x.cell].surface, swatch: (x) => surfaceColour(model.surfaces.indexOf(model.cells[x.cell].surface)) },
          { header: 'P(surveyed)', text: (x) => formatNumber(x.surveyedP, 'p'), numeric: true },
          { header: 'most likely reading', text: (x) => model.surfaces[x.likely], swatch: (x) => surfaceColour(x.likely) },
          { header: 'P(most likely)', text: (x) => formatNumber(x.likelyP, 'p'), numeric: true },
        ],
        list.slice(0, MAX_LISTED),
      ) +
      (list.length > MAX_LISTED ? `<p class="more">and ${list.length - MAX_LISTED} more.</p>` : '')
    : '<p>Every cell reads its surveyed surface more often than anything else.</p>';
  return (
    '<section id="emissions" aria-labelledby="emissions-h">' +
    '<h2 id="emissions-h">Emission table</h2>' +
    '<p class="lede">What the sensor reports in each cell: one column per cell, grouped by surveyed surface (within a group, the cells that read their surface least reliably come last), one row per reading. The outlined row in each group is what the survey expects the sensor to read.</p>' +
    `<figure class="wide">${svgEmissionHeatmap(model)}</figure>` +
    '<div class="legend-row">' +
    svgRampLegend({ title: 'P(reading | cell)', domain: [0, 1], format: (v) => formatNumber(v, 'g'), idPrefix: 'lg-emission' }) +
    htmlSwatchLegend([
      { colour: INK, label: 'surveyed surface (expected reading)', mark: 'outline' },
      { colour: INK, label: 'most likely reading is not the surveyed one', mark: 'triangle' },
    ]) +
    '</div>' +
    table +
    '</section>'
  );
}
