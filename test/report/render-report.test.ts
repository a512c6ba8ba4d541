import { describe, it, expect } from 'vitest';
import { buildReportData } from '../../src/report/build-report-data.js';
import { renderReport, REPORT_SECTIONS } from '../../src/report/render-report.js';
import { escapeHtml } from '../../src/report/escape-html.js';
import { reportFixture, HOSTILE } from './report-fixture.js';

describe('renderReport(buildReportData(inputs))', () => {
  const inputs = reportFixture();
  const data = buildReportData(inputs);
  const html = renderReport(data);

  it('has every section, in order, and a navigation link to each', () => {
    let at = -1;
    for (const [id] of REPORT_SECTIONS) {
      const pos = html.indexOf(`<section id="${id}"`);
      expect(pos, id).toBeGreaterThan(at);
      at = pos;
      expect(html).toContain(`<a href="#${id}">`);
    }
  });

  it('is self-contained: no script, no external reference, and a policy that forbids loading anything', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/\son[a-z]+\s*=/i); // no event-handler attributes
    expect(html).not.toMatch(/(src|href)\s*=\s*"(?!#|data:)/i);
    expect(html).not.toMatch(/url\((?!#)/); // CSS/SVG url() only to ids in the page
    expect(html).not.toMatch(/@import|@font-face/);
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'`);
  });

  it('is deterministic: the same inputs give the same bytes', () => {
    expect(renderReport(buildReportData(reportFixture()))).toBe(html);
  });

  it('shows the summary figures: building, restarts, the chosen restart and its scores, the safety caution', () => {
    expect(html).toContain('<h1>Fixture Hall (invented)</h1>');
    expect(html).toContain('chosen: restart 2 (seed 12), by held-out score');
    expect(html).toContain('−1.04100'); // held-out log-likelihood per reading of restart 2
    expect(html).toContain('−1.01200');
    expect(html).toMatch(/not a safety function/);
    expect(html).toMatch(/certified safety systems, to local codes/);
  });

  it('draws one map per level with an overlay per available input, the one-way link as an arrow and the lift as a dot', () => {
    expect(html.match(/<figure class="level-map">/g)).toHaveLength(4); // 2 levels × (floor map, ambiguity)
    for (const key of ['surface', 'visits', 'confidence', 'changes']) expect(html, key).toContain(`id="ov-${key}"`);
    const floorMap = html.slice(html.indexOf('<section id="floor-map"'), html.indexOf('<section id="restarts"'));
    expect(floorMap.match(/<line class="oneway"[^>]*marker-end="url\(#fm-0-arrow\)"/g)).toHaveLength(1);
    expect(floorMap.match(/<circle class="cross-level"/g)).toHaveLength(2); // one end on each level
    expect(floorMap.match(/<g class="layer layer-surface">/g)).toHaveLength(2);
    expect(floorMap).toContain('G-1-1: changed (region R1), reads tile → oak');
    // Reported changes: one row per region, with the cells that could carry it and its sentence.
    expect(floorMap).toContain('<h3>Reported changes</h3>');
    expect(floorMap).toContain('<td>R1</td><td>G-1-1 (placed)</td><td>tile</td><td>oak</td>');
    expect(floorMap).toContain('Reads oak 70 % of the time, was tile 80 %');
  });

  it('outlines and names the zones on every map of a level that has them, and rates recovery per zone', () => {
    const floorMap = html.slice(html.indexOf('<section id="floor-map"'), html.indexOf('<section id="restarts"'));
    expect(floorMap.match(/<path class="zone-outline"/g)).toHaveLength(1); // the upper floor has no zones
    expect(floorMap).toMatch(/<text [^>]*>West wing<\/text>/);
    expect(floorMap).toMatch(/<text [^>]*>East wing<\/text>/);
    const ambiguity = html.slice(html.indexOf('<section id="ambiguity"'), html.indexOf('<section id="runs"'));
    expect(ambiguity).toContain('id="ov-zone-recovery"');
    expect(ambiguity.match(/<path class="zone-outline"/g)).toHaveLength(1);
    expect(ambiguity).toContain('Zones: which a planner can trust');
    expect(ambiguity).toMatch(/<td>West wing<\/td>/);
    expect(ambiguity).toMatch(/<td>East wing<\/td>/);
    const noZones = reportFixture();
    noZones.modelFile.model.cells.forEach((c) => delete c.zone);
    const plain = renderReport(buildReportData(noZones));
    expect(plain).not.toContain('zone-outline');
    expect(plain).not.toContain('id="ov-zone-recovery"');
    expect(plain).not.toContain('Zones: which a planner can trust');
  });

  it('leaves out overlays whose input is missing', () => {
    const bare = renderReport(buildReportData({ ...reportFixture(), annotated: null, changes: null, runRows: null }));
    expect(bare).toContain('id="ov-surface"');
    for (const key of ['visits', 'confidence', 'changes']) expect(bare, key).not.toContain(`id="ov-${key}"`);
    expect(bare).toContain('No run summary or annotated table was given');
  });

  it('marks the chosen restart and draws a convergence curve per restart plus the final pass', () => {
    const restarts = html.slice(html.indexOf('<section id="restarts"'), html.indexOf('<section id="emissions"'));
    expect(restarts.match(/class="restart-point chosen"/g)).toHaveLength(1);
    expect(restarts.match(/class="restart-point"/g)).toHaveLength(2);
    expect(restarts).toContain('2 ★ chosen');
    expect(restarts.match(/<path d="M[^"]+" stroke="/g)).toHaveLength(4);
  });

  it('lists the cell that reads unlike its survey, in the table and under the heat map', () => {
    const emissions = html.slice(html.indexOf('<section id="emissions"'), html.indexOf('<section id="ambiguity"'));
    expect(emissions.match(/class="disagrees"/g)).toHaveLength(1);
    expect(emissions).toContain('<td>G-1-1</td>');
    expect(emissions.match(/<rect class="expected"/g)).toHaveLength(3); // one outlined row per surveyed surface
  });

  it('plots training log-likelihood by restart number when no runs were held out, and says so when there is no fit record', () => {
    const inputs = reportFixture();
    const fit = inputs.modelFile.fit!;
    const noHeldOut = { ...fit, selectedBy: 'training' as const, restarts: fit.restarts.map((r) => ({ ...r, heldOutLogLikPerReading: null })) };
    const page = renderReport(buildReportData({ ...inputs, modelFile: { ...inputs.modelFile, fit: noHeldOut } }));
    expect(page).toContain('>restart</text>'); // x-axis title
    expect(page).toContain('No runs were held out, so the restart with the best training log-likelihood per reading was chosen.');
    const unfitted = renderReport(buildReportData({ ...inputs, modelFile: { ...inputs.modelFile, fit: null } }));
    expect(unfitted).toContain('This model has no fit record, so there are no restarts to compare.');
    expect(unfitted).toContain('<section id="restarts"');
  });

  it('ranks the runs and names the simulation behind the ambiguity ratings', () => {
    expect(html).toContain('Lowest log-likelihood per reading');
    expect(html).toContain('Highest share of low-confidence steps');
    expect(html).toContain('30 runs of 100 steps were simulated from the fitted model (seed 5');
  });

  it('escapes every label from the input files: a cell named <img src=x onerror=alert(1)> appears as text', () => {
    const hostile = renderReport(buildReportData(reportFixture(true)));
    for (const label of Object.values(HOSTILE)) {
      expect(hostile).toContain(escapeHtml(label));
    }
    expect(hostile).not.toMatch(/<script/i);
    expect(hostile).not.toMatch(/<img/i);
    expect(hostile).not.toMatch(/<b>tile/);
    expect(hostile).toContain('&lt;img src=x onerror=alert(1)&gt;');
  });
});

describe('escapeHtml(text)', () => {
  it('replaces the five characters that can open markup or close an attribute, and nothing else', () => {
    // Source: HTML Living Standard, 13.3 "Serializing HTML fragments" (escaping a string), plus ' for single-quoted attributes.
    expect(escapeHtml(`a&b<c>d"e'f`)).toBe('a&amp;b&lt;c&gt;d&quot;e&#39;f');
    expect(escapeHtml('Quillmoor — café, 2 m²')).toBe('Quillmoor — café, 2 m²');
    expect(escapeHtml('&amp;')).toBe('&amp;amp;');
  });
});
