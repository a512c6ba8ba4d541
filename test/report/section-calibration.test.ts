import { describe, it, expect } from 'vitest';
import { buildReportData } from '../../src/report/build-report-data.js';
import { sectionCalibration } from '../../src/report/section-calibration.js';
import { sectionRestarts } from '../../src/report/section-restarts.js';
import { calibrationFromSums } from '../../src/fit/predictive-calibration.js';
import { reportFixture } from './report-fixture.js';

describe('report: forecast calibration and transition modes', () => {
  const data = buildReportData(reportFixture());
  const fit = data.modelFile.fit!;

  it('draws the recorded reliability table (one circle per non-empty bin), its error, and what it does not show', () => {
    const sums = new Float64Array(30);
    sums.set([100, 35, 30], 3 * 3);
    sums.set([50, 27.5, 30], 3 * 5);
    const cal = calibrationFromSums(sums, 10)!;
    const html = sectionCalibration({ ...data, modelFile: { ...data.modelFile, fit: { ...fit, predictiveCalibration: cal } } });
    expect(html).toContain('<section id="calibration"');
    expect(html.match(/class="reliability-bin"/g)).toHaveLength(2);
    expect(html).toContain(`<strong>${cal.ece.toFixed(3)}</strong>`);
    expect(html).toContain('150 held-out readings');
    expect(html).toMatch(/not of <em>positions<\/em>/);
  });

  it('says why there is no table when nothing was held out or there is no fit record', () => {
    const none = sectionCalibration({ ...data, modelFile: { ...data.modelFile, fit: { ...fit, predictiveCalibration: null } } });
    expect(none).toContain('nothing to check the forecasts on');
    expect(none).not.toContain('reliability-bin');
    expect(sectionCalibration({ ...data, modelFile: { ...data.modelFile, fit: null } })).toContain('no fit record');
  });

  it('shows each restart\'s transition mode and the chosen mode when the fit was auto', () => {
    const modes = ['fixed', 'tied', 'learned'] as const;
    const restarts = fit.restarts.map((r, k) => ({ ...r, mode: modes[k % 3] }));
    const html = sectionRestarts({ ...data, modelFile: { ...data.modelFile, fit: { ...fit, restarts, options: { ...fit.options, transitions: 'auto' } } } });
    expect(html).toContain('<th scope="col">transitions</th>');
    expect(html).toContain(`the chosen mode is <strong>${restarts[fit.selected].mode}</strong>`);
    expect(sectionRestarts(data)).not.toContain('<th scope="col">transitions</th>');
  });
});
