import type { ReportData } from './report-data.js';
import { svgFloorMap, type MapLayer } from './svg-floor-map.js';
import { svgRampLegend } from './svg-ramp-legend.js';
import { htmlSwatchLegend } from './html-swatch-legend.js';
import { mapScale } from './map-scale.js';
import { levelKey } from './level-key.js';
import { htmlTable } from './html-table.js';
import { escapeHtml } from './escape-html.js';
import { htmlCard } from './html-card.js';
import { formatNumber } from './format-number.js';
import { NO_DATA_COLOUR, rampColour } from './palette.js';

const MAX_LISTED = 15;

/**
 * What `likely_p`/`path_p` mean and how well calibrated they were measured to be against known
 * positions on the tool's own invented misspecified buildings (test/cli/calibration.test.ts and
 * bench/calibration-figures.ts; figures in DEVELOPERS.md, "Calibration").
 */
const LIKELY_P_NOTE =
  '<h3>What the decoded probabilities mean</h3>' +
  '<p><code>likely_p</code> and <code>path_p</code> in the annotated table are posterior probabilities <em>under this model</em>, and so is every figure above: ' +
  'the simulated runs come from the fitted model itself, so this section shows what the model believes about its own ambiguity, not whether the model is right. ' +
  'Measured against known positions on underfoot\'s own simulated buildings whose true movement the model does not share (each cell its own dwell, unequal links): ' +
  'where neighbouring cells read differently, the default fit\'s <code>likely_p</code> had an expected calibration error of 0.018, i.e. on average within about 2 points of how often it was right, ' +
  'while fits with one building-wide dwell were overconfident (error 0.046–0.108); where rooms of 2 × 2 cells share one surface, every fit was overconfident about the exact cell ' +
  '(error 0.047–0.096) while the cell within 1.5 m was right 85–88 % of the time. ' +
  'Treat hatched cells\' positions at room level.</p>';

/**
 * Section 5: how often decoding recovers each cell, from runs simulated from the fitted model; maps with
 * the ambiguous cells hatched, and the least recoverable cells with the cell they are mistaken for. When
 * the model has zones: the same per zone (recovery of the true zone, on the map and in a table) — which
 * zones a planner can trust where single cells cannot be told apart.
 */
export function sectionAmbiguity(d: ReportData): string {
  const { model } = d.modelFile;
  const a = d.ambiguity;
  const o = a.options;
  const ids = model.cells.map((c) => c.id);
  const rated: number[] = [];
  for (let i = 0; i < ids.length; i++) if (a.visits[i] >= o.minVisits) rated.push(i);
  const nAmbiguous = rated.filter((i) => a.ambiguous[i]).length;
  const median = (values: number[]): number => {
    if (!values.length) return NaN;
    const v = [...values].sort((x, y) => x - y);
    return v.length % 2 ? v[(v.length - 1) / 2] : (v[v.length / 2 - 1] + v[v.length / 2]) / 2;
  };
  const scale = mapScale(d.geometry, 500, 22);
  const maxError = Math.max(1e-9, ...rated.map((i) => a.errorM[i]));
  const describe = (i: number): string => {
    if (a.visits[i] < o.minVisits) return `${ids[i]}: only ${a.visits[i]} simulated visits, not rated`;
    const partner = a.confusedWith[i] >= 0 ? `; most often mistaken for ${ids[a.confusedWith[i]]} (${formatNumber(a.confusedP[i], 'p')})` : '';
    return `${ids[i]}: recovered ${formatNumber(a.recovery[i], 'pct')} of the time, within one link ${formatNumber(a.nearRecovery[i], 'pct')}, expected error ${formatNumber(a.errorM[i], 'g')} m${partner}${a.ambiguous[i] ? ' (ambiguous)' : ''}`;
  };
  const unratedCell = (i: number): boolean => a.visits[i] < o.minVisits;
  const zones = a.zones;
  const zoneIndex = new Map(zones.map((z, k) => [z.zone, k] as const));
  const zoneOfCell = (i: number): number => (model.cells[i].zone === undefined ? -1 : (zoneIndex.get(model.cells[i].zone as string) ?? -1));
  const unratedZone = (k: number): boolean => k < 0 || zones[k].visits < o.minVisits;
  const describeZone = (i: number): string => {
    const k = zoneOfCell(i);
    if (k < 0) return `${ids[i]}: no zone`;
    const z = zones[k];
    if (unratedZone(k)) return `zone ${z.zone} (${ids[i]}): only ${z.visits} simulated visits, not rated`;
    const partner = z.confusedWith >= 0 ? `; most often mistaken for ${zones[z.confusedWith].zone} (${formatNumber(z.confusedP, 'p')})` : '';
    return `zone ${z.zone} (${ids[i]}): recovered ${formatNumber(z.recovery, 'pct')} of the time (its cells ${formatNumber(z.cellRecovery, 'pct')})${partner}${z.ambiguous ? ' (ambiguous)' : ''}`;
  };
  const layers: MapLayer[] = [
    {
      key: 'recovery',
      fill: (i) => (unratedCell(i) ? NO_DATA_COLOUR : rampColour(a.recovery[i])),
      noData: unratedCell,
      hatch: (i) => (a.ambiguous[i] ? 'dark' : false),
      title: describe,
    },
    ...(zones.length
      ? [
          {
            key: 'zone-recovery',
            fill: (i: number) => (unratedZone(zoneOfCell(i)) ? NO_DATA_COLOUR : rampColour(zones[zoneOfCell(i)].recovery)),
            noData: (i: number) => unratedZone(zoneOfCell(i)),
            hatch: (i: number) => (zoneOfCell(i) >= 0 && zones[zoneOfCell(i)].ambiguous ? ('dark' as const) : false),
            title: describeZone,
          },
        ]
      : []),
    {
      key: 'error',
      fill: (i) => (unratedCell(i) ? NO_DATA_COLOUR : rampColour(1 - a.errorM[i] / maxError)),
      noData: unratedCell,
      title: describe,
    },
  ];
  const maps = d.geometry.levels
    .map((level) => {
      const svg = svgFloorMap(model, d.geometry, level, layers, { pxPerM: scale, idPrefix: `amb-${levelKey(level.level)}`, label: `Localization ambiguity, level ${level.level}` });
      return `<figure class="level-map"><figcaption>Level ${escapeHtml(String(level.level))}</figcaption>${svg}</figure>`;
    })
    .join('');
  const unratedSwatch = { colour: NO_DATA_COLOUR, label: `fewer than ${o.minVisits} simulated visits`, mark: 'dashed' } as const;
  const hatchSwatch = { colour: rampColour(0.2), label: `ambiguous (recovered less than ${formatNumber(o.threshold, 'pct')} of the time)`, mark: 'hatch' } as const;
  const switcher =
    '<div class="overlays">' +
    '<input type="radio" name="amb-overlay" id="ov-recovery" class="ov-radio" checked>' +
    (zones.length ? '<input type="radio" name="amb-overlay" id="ov-zone-recovery" class="ov-radio">' : '') +
    '<input type="radio" name="amb-overlay" id="ov-error" class="ov-radio">' +
    `<div class="ov-tabs" role="group" aria-label="Ambiguity overlay"><label for="ov-recovery" class="ov-tab">Cell recovery</label>${zones.length ? '<label for="ov-zone-recovery" class="ov-tab">Zone recovery</label>' : ''}<label for="ov-error" class="ov-tab">Expected position error</label></div>` +
    '<div class="ov-legends">' +
    `<div class="ov-legend lg-recovery"><div class="legend-row">${svgRampLegend({ title: 'recovery: probability of the true cell', domain: [0, 1], format: (v) => formatNumber(v, 'g'), idPrefix: 'lg-recovery' })}${htmlSwatchLegend([hatchSwatch, unratedSwatch])}</div></div>` +
    (zones.length
      ? `<div class="ov-legend lg-zone-recovery"><div class="legend-row">${svgRampLegend({ title: 'zone recovery: probability of the true zone', domain: [0, 1], format: (v) => formatNumber(v, 'g'), idPrefix: 'lg-zone-recovery' })}${htmlSwatchLegend([
          { colour: rampColour(0.2), label: `ambiguous zone (recovered less than ${formatNumber(o.threshold, 'pct')} of the time)`, mark: 'hatch' },
          { colour: NO_DATA_COLOUR, label: `no zone, or fewer than ${o.minVisits} simulated visits`, mark: 'dashed' },
        ])}</div></div>`
      : '') +
    `<div class="ov-legend lg-error"><div class="legend-row">${svgRampLegend({ title: 'expected distance from the true cell (m)', domain: [0, maxError], format: (v) => formatNumber(v, 'g'), reverse: true, idPrefix: 'lg-error' })}${htmlSwatchLegend([unratedSwatch])}</div></div>` +
    '</div>' +
    `<div class="maps">${maps}</div></div>`;
  const worst = rated.sort((x, y) => a.recovery[x] - a.recovery[y] || x - y).slice(0, MAX_LISTED);
  const table = htmlTable(
    [
      { header: 'cell', text: (i: number) => ids[i] },
      { header: 'surveyed', text: (i) => model.cells[i].surface },
      { header: 'simulated visits', text: (i) => formatNumber(a.visits[i], 'int'), numeric: true },
      { header: 'recovered', text: (i) => formatNumber(a.recovery[i], 'pct'), numeric: true },
      { header: 'within one link', text: (i) => formatNumber(a.nearRecovery[i], 'pct'), numeric: true },
      { header: 'expected error (m)', text: (i) => formatNumber(a.errorM[i], 'g'), numeric: true },
      { header: 'most often mistaken for', text: (i) => (a.confusedWith[i] >= 0 ? ids[a.confusedWith[i]] : '–') },
      { header: 'P(that cell)', text: (i) => (a.confusedWith[i] >= 0 ? formatNumber(a.confusedP[i], 'p') : '–'), numeric: true },
    ],
    worst,
  );
  const zoneOrder = zones.map((_, k) => k).sort((x, y) => {
    const rx = unratedZone(x) ? Infinity : zones[x].recovery;
    const ry = unratedZone(y) ? Infinity : zones[y].recovery;
    return rx - ry || x - y;
  });
  const ratedZones = zoneOrder.filter((k) => !unratedZone(k));
  const trusted = ratedZones.filter((k) => !zones[k].ambiguous).length;
  const zoneTable = zones.length
    ? `<h3>Zones: which a planner can trust</h3>` +
      `<p class="caption">Per zone, the mean posterior probability of the true zone (summed over its cells) while a simulated robot was in it, beside the mean recovery of its cells. ${trusted} of ${ratedZones.length} rated zones are recovered at least ${formatNumber(o.threshold, 'pct')} of the time; the least recoverable come first.</p>` +
      htmlTable(
        [
          { header: 'zone', text: (k: number) => zones[k].zone },
          { header: 'cells', text: (k) => formatNumber(zones[k].cells, 'int'), numeric: true },
          { header: 'simulated visits', text: (k) => formatNumber(zones[k].visits, 'int'), numeric: true },
          { header: 'zone recovered', text: (k) => (unratedZone(k) ? 'not rated' : formatNumber(zones[k].recovery, 'pct')), numeric: true },
          { header: 'its cells recovered', text: (k) => (unratedZone(k) ? '–' : formatNumber(zones[k].cellRecovery, 'pct')), numeric: true },
          { header: 'most often mistaken for', text: (k) => (zones[k].confusedWith >= 0 ? zones[zones[k].confusedWith].zone : '–') },
          { header: 'P(that zone)', text: (k) => (zones[k].confusedWith >= 0 ? formatNumber(zones[k].confusedP, 'p') : '–'), numeric: true },
          { header: 'trust', text: (k) => (unratedZone(k) ? '–' : zones[k].ambiguous ? 'ambiguous' : 'yes') },
        ],
        zoneOrder,
      )
    : '';
  const recov = rated.map((i) => a.recovery[i]);
  const near = rated.map((i) => a.nearRecovery[i]);
  const err = rated.map((i) => a.errorM[i]);
  const unrated = ids.length - rated.length;
  const facts =
    `<div class="cards compact">` +
    htmlCard('ambiguous cells', `${nAmbiguous} of ${rated.length}`, `recovered less than ${formatNumber(o.threshold, 'pct')} of the time`) +
    htmlCard('median recovery', formatNumber(median(recov), 'pct'), 'posterior probability of the true cell') +
    htmlCard('median within one link', formatNumber(median(near), 'pct'), 'true cell or a linked neighbour') +
    htmlCard('median expected error', `${formatNumber(median(err), 'g')} m`, `planar distance, +${o.levelGapM} m per level`) +
    (zones.length ? htmlCard('median zone recovery', formatNumber(median(ratedZones.map((k) => zones[k].recovery)), 'pct'), `posterior probability of the true zone (${ratedZones.length} zones rated)`) : '') +
    `</div>`;
  return (
    '<section id="ambiguity" aria-labelledby="ambiguity-h">' +
    '<h2 id="ambiguity-h">Localization ambiguity</h2>' +
    `<p class="lede">Where a planner should not trust cell-level positions. ${formatNumber(o.runs, 'int')} runs of ${formatNumber(o.steps, 'int')} steps were simulated from the fitted model (seed ${o.seed}${o.dropoutRate > 0 ? `, ${formatNumber(o.dropoutRate, 'pct')} dropouts as in the real runs` : ''}${a.odometry ? ', with simulated wheel odometry' : ''}) and decoded${a.odometry ? ' with the model\'s movement parameters, as runs with odometry are' : ''}; a cell's <em>recovery</em> is the mean posterior probability of the true cell while a robot was in it — how often decoding puts the robot in the right cell. Cells recovered less than ${formatNumber(o.threshold, 'pct')} of the time cannot be told apart from their neighbours or look-alikes and are hatched.${unrated ? ` ${unrated} cell${unrated === 1 ? ' was' : 's were'} visited fewer than ${o.minVisits} times and ${unrated === 1 ? 'is' : 'are'} not rated.` : ''}</p>` +
    facts +
    switcher +
    `<h3>Least recoverable cells</h3>` +
    table +
    zoneTable +
    LIKELY_P_NOTE +
    '</section>'
  );
}

