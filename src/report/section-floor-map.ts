import type { ChangeRow, ReportData } from './report-data.js';
import { svgFloorMap, type MapLayer } from './svg-floor-map.js';
import { svgRampLegend } from './svg-ramp-legend.js';
import { htmlSwatchLegend } from './html-swatch-legend.js';
import { mapKeyLegend } from './map-key-legend.js';
import { mapScale } from './map-scale.js';
import { levelKey } from './level-key.js';
import { htmlTable } from './html-table.js';
import { escapeHtml } from './escape-html.js';
import { formatNumber } from './format-number.js';
import { NO_DATA_COLOUR, VERDICT_COLOURS, rampColour, surfaceColour, surfaceHatched } from './palette.js';

interface Overlay {
  layer: MapLayer;
  tab: string;
  legend: string;
  caption: string;
}

/**
 * Section 2: one map per level with switchable overlays (surveyed surface, visit share, mean decoding
 * confidence, changed cells), switched by radio buttons and CSS (the page has no script).
 */
export function sectionFloorMap(d: ReportData): string {
  const { model } = d.modelFile;
  const m = model.surfaces.length;
  const ids = model.cells.map((c) => c.id);
  const surfaceIndex = new Map(model.surfaces.map((s, r) => [s, r] as const));
  const surveyed = model.cells.map((c) => surfaceIndex.get(c.surface) ?? 0);
  const overlays: Overlay[] = [];

  overlays.push({
    tab: 'Surveyed surface',
    layer: {
      key: 'surface',
      fill: (i) => surfaceColour(surveyed[i]),
      hatch: (i) => (surfaceHatched(surveyed[i]) ? 'light' : false),
      title: (i) => {
        let best = 0;
        for (let r = 1; r < m; r++) if (model.emission[i * m + r] > model.emission[i * m + best]) best = r;
        return `${ids[i]} (level ${model.cells[i].level}): surveyed ${model.cells[i].surface}; reads ${model.surfaces[best]} most often (${formatNumber(model.emission[i * m + best], 'p')})`;
      },
    },
    legend: htmlSwatchLegend(model.surfaces.map((s, r) => ({ colour: surfaceColour(r), label: s, mark: surfaceHatched(r) ? 'light-hatch' : undefined })), 'surveyed surface'),
    caption: 'What the site survey found in each cell.',
  });

  if (d.visits) {
    const visits = d.visits;
    const total = visits.reduce((a, b) => a + b, 0);
    const max = total > 0 ? Math.max(...visits) / total : 1;
    overlays.push({
      tab: 'Visit share',
      layer: {
        key: 'visits',
        fill: (i) => (total > 0 ? rampColour(Math.sqrt(visits[i] / total / max)) : NO_DATA_COLOUR),
        noData: () => total === 0,
        title: (i) => `${ids[i]}: ${formatNumber(total > 0 ? visits[i] / total : NaN, 'pct')} of all readings (${formatNumber(visits[i], 'g')} expected readings)`,
      },
      legend: svgRampLegend({ title: 'share of all readings (expected)', domain: [0, max], format: (v) => formatNumber(v, 'pct~'), sqrt: true, idPrefix: 'lg-visits' }),
      caption:
        d.visitsFrom === 'annotated'
          ? 'Where the robots spent their readings, as far as the model can tell: expected readings per cell over the annotated runs (one forward-backward pass), square-root colour scale.'
          : 'Where the robots spent their readings: expected readings per cell recorded with the fit, square-root colour scale.',
    });
  }

  if (d.confidence && d.pathSteps) {
    const conf = d.confidence;
    const steps = d.pathSteps;
    overlays.push({
      tab: 'Decoding confidence',
      layer: {
        key: 'confidence',
        fill: (i) => (Number.isNaN(conf[i]) ? NO_DATA_COLOUR : rampColour(conf[i])),
        noData: (i) => Number.isNaN(conf[i]),
        title: (i) => (Number.isNaN(conf[i]) ? `${ids[i]}: never on a decoded path` : `${ids[i]}: mean posterior ${formatNumber(conf[i], 'p')} over ${formatNumber(steps[i], 'int')} decoded steps`),
      },
      legend:
        svgRampLegend({ title: 'mean posterior of the decoded cell', domain: [0, 1], format: (v) => formatNumber(v, 'g'), idPrefix: 'lg-confidence' }) +
        htmlSwatchLegend([{ colour: NO_DATA_COLOUR, label: 'never on a decoded path', mark: 'dashed' }]),
      caption: 'How sure decoding was when it put a robot in each cell: the mean posterior probability of the path cell (path_p) over the steps decoded onto it. Dark cells are decoded with confidence; pale ones are guesses among look-alikes.',
    });
  }

  if (d.changes) {
    const ch = d.changes;
    overlays.push({
      tab: 'Changed cells',
      layer: {
        key: 'changes',
        fill: (i) => (ch[i] ? VERDICT_COLOURS[ch[i]!.verdict] : NO_DATA_COLOUR),
        noData: (i) => !ch[i],
        title: (i) => {
          const c = ch[i];
          if (!c) return `${ids[i]}: not in the changes table`;
          const move = c.surfaceBefore && c.surfaceAfter ? `, reads ${c.surfaceBefore} → ${c.surfaceAfter}` : '';
          const region = c.region && c.candidates.length > 1 ? ` (region ${c.region}, ${c.candidates.length} cells)` : c.region ? ` (region ${c.region})` : '';
          return `${ids[i]}: ${c.verdict}${region}${move}; total variation ${formatNumber(c.tvDistance, 'p')}, q ${formatNumber(c.qValue, 'g')}, ${formatNumber(c.expectedReadings, 'g')} expected readings${c.explanation ? `. ${c.explanation}` : ''}`;
        },
      },
      legend: htmlSwatchLegend([
        { colour: VERDICT_COLOURS.changed, label: 'changed' },
        { colour: VERDICT_COLOURS.unchanged, label: 'unchanged' },
        { colour: VERDICT_COLOURS['too-few-readings'], label: 'too few readings to tell' },
        { colour: NO_DATA_COLOUR, label: 'not in the table', mark: 'dashed' },
      ]),
      caption: 'Cells whose readings changed after the re-fit (the changes table from compare).',
    });
  }

  const scale = mapScale(d.geometry);
  const figures = d.geometry.levels
    .map((level) => {
      const layers = overlays.map((o) => o.layer);
      const svg = svgFloorMap(model, d.geometry, level, layers, { pxPerM: scale, idPrefix: `fm-${levelKey(level.level)}`, label: `Floor map, level ${level.level}` });
      return `<figure class="level-map"><figcaption>Level ${escapeHtml(String(level.level))} · ${level.cells.length} cells</figcaption>${svg}</figure>`;
    })
    .join('');
  const radios = overlays.map((o, k) => `<input type="radio" name="overlay" id="ov-${o.layer.key}" class="ov-radio"${k === 0 ? ' checked' : ''}>`).join('');
  const tabs = overlays.map((o) => `<label for="ov-${o.layer.key}" class="ov-tab">${escapeHtml(o.tab)}</label>`).join('');
  const legends = overlays.map((o) => `<div class="ov-legend lg-${o.layer.key}"><p class="caption">${escapeHtml(o.caption)}</p>${o.legend}</div>`).join('');
  let changedTable = '';
  if (d.changeRows) {
    const changed = d.changeRows.filter((c) => c.verdict === 'changed');
    // One row per reported change: a region (cells the runs cannot tell apart) or, in tables written
    // before regions, a cell. Its strongest cell (listed first in the region's candidates) speaks for it.
    const byRegion = new Map<string, ChangeRow[]>();
    for (const c of changed) {
      const key = c.region ?? `cell ${c.cell}`;
      byRegion.set(key, [...(byRegion.get(key) ?? []), c]);
    }
    const reported = [...byRegion.entries()].map(([key, rows]) => {
      const lead = rows.find((c) => c.candidates[0] === c.cell) ?? rows[0];
      return { key, lead, cells: lead.candidates.length ? lead.candidates : rows.map((c) => c.cell) };
    });
    changedTable = reported.length
      ? `<h3>Reported changes</h3>` +
        '<p>Each reported change is a region: one cell where the runs place it, or the cells the runs cannot tell apart (they read alike and lie near each other), any of which could carry it. The false-discovery rate holds over these changes. A change over several cells is not written to a floor by <code>compare --write-floor</code>: inspect its cells on site.</p>' +
        htmlTable(
          [
            { header: 'region', text: (r) => (r.lead.region ?? '–') },
            { header: 'cells that could carry it', text: (r) => (r.cells.length === 1 ? `${r.cells[0]} (placed)` : `${r.cells.length}: ${r.cells.join(', ')}`) },
            { header: 'reads before', text: (r) => r.lead.surfaceBefore ?? '–' },
            { header: 'reads after', text: (r) => r.lead.surfaceAfter ?? '–' },
            { header: 'q-value', text: (r) => formatNumber(r.lead.qValue, 'g'), numeric: true },
            { header: 'why', text: (r) => r.lead.explanation ?? `total variation ${formatNumber(r.lead.tvDistance, 'p')} over ${formatNumber(r.lead.expectedReadings, 'g')} expected readings` },
          ],
          reported.slice(0, 40),
        ) +
        (reported.length > 40 ? `<p class="more">and ${reported.length - 40} more reported changes in the changes table.</p>` : '')
      : '<p>The changes table reports no change.</p>';
  }
  return (
    '<section id="floor-map" aria-labelledby="floor-map-h">' +
    '<h2 id="floor-map-h">Floor map</h2>' +
    '<p class="lede">Every cell of the floor graph at its surveyed position (north up), one map per level. Pick an overlay; hover a cell for its figures.</p>' +
    `<div class="overlays">${radios}<div class="ov-tabs" role="group" aria-label="Overlay">${tabs}</div><div class="ov-legends">${legends}</div>` +
    `<div class="maps">${figures}</div></div>` +
    mapKeyLegend(model, d.geometry) +
    changedTable +
    '</section>'
  );
}

