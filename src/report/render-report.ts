import type { ReportData } from './report-data.js';
import { escapeHtml } from './escape-html.js';
import { REPORT_STYLE } from './report-style.js';
import { sectionSummary } from './section-summary.js';
import { sectionFloorMap } from './section-floor-map.js';
import { sectionRestarts } from './section-restarts.js';
import { sectionCalibration } from './section-calibration.js';
import { sectionEmissions } from './section-emissions.js';
import { sectionAmbiguity } from './section-ambiguity.js';
import { sectionRuns } from './section-runs.js';

/** Section ids in page order, with their navigation labels. */
export const REPORT_SECTIONS: ReadonlyArray<readonly [string, string]> = [
  ['summary', 'Summary'],
  ['floor-map', 'Floor map'],
  ['restarts', 'Restarts'],
  ['calibration', 'Forecast calibration'],
  ['emissions', 'Emission table'],
  ['ambiguity', 'Localization ambiguity'],
  ['runs', 'Runs'],
];

/**
 * The whole report as one self-contained HTML document: inline style, inline SVG, no script, no fonts,
 * images or anything else to fetch; a Content-Security-Policy that forbids every load and every script
 * backs that up. The same data give the same bytes (no clock, no randomness beyond seeded simulation).
 */
export function renderReport(d: ReportData): string {
  const title = d.title || 'Unnamed building';
  const src = d.sources;
  const inputs = [
    ['model', src.model],
    ['floor', src.floor],
    ['annotated table', src.annotated],
    ['run summary', src.summary],
    ['changes table', src.changes],
  ]
    .filter((x): x is [string, string] => x[1] !== null)
    .map(([k, v]) => `${escapeHtml(k)} <code>${escapeHtml(v)}</code>`)
    .join(', ');
  return (
    '<!DOCTYPE html>\n<html lang="en">\n<head>\n<meta charset="utf-8">\n' +
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'">\n` +
    '<meta name="viewport" content="width=device-width, initial-scale=1">\n' +
    `<meta name="generator" content="underfoot ${escapeHtml(d.toolVersion)}">\n` +
    '<link rel="icon" href="data:,">\n' +
    `<title>${escapeHtml(title)} · underfoot report</title>\n` +
    `<style>${REPORT_STYLE}</style>\n</head>\n<body>\n` +
    '<header class="top">' +
    '<p class="kicker">underfoot · floor-sensor calibration report</p>' +
    `<h1>${escapeHtml(title)}</h1>` +
    `<p class="sub">${escapeHtml(`${d.modelFile.model.cells.length} cells · ${d.geometry.levels.length} level${d.geometry.levels.length === 1 ? '' : 's'} · surfaces: ${d.modelFile.model.surfaces.join(', ')}`)}</p>` +
    `<nav class="toc" aria-label="Sections">${REPORT_SECTIONS.map(([id, label]) => `<a href="#${id}">${escapeHtml(label)}</a>`).join('')}</nav>` +
    '</header>\n<main>\n' +
    sectionSummary(d) + '\n' +
    sectionFloorMap(d) + '\n' +
    sectionRestarts(d) + '\n' +
    sectionCalibration(d) + '\n' +
    sectionEmissions(d) + '\n' +
    sectionAmbiguity(d) + '\n' +
    sectionRuns(d) + '\n' +
    '</main>\n' +
    `<footer>Made by underfoot ${escapeHtml(d.toolVersion)} from ${inputs}. This file loads nothing and runs no script; it opens offline in any browser.</footer>\n` +
    '</body>\n</html>\n'
  );
}
