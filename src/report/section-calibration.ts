import type { ReportData } from './report-data.js';
import type { ReliabilityBin } from '../fit/predictive-calibration.js';
import { svgReliabilityChart } from './svg-reliability-chart.js';
import { htmlTable } from './html-table.js';
import { formatNumber } from './format-number.js';

/**
 * Section after the restarts: the label-free calibration check recorded by `fit` — the chosen
 * restart's one-step-ahead reading forecasts on the held-out runs against the readings that came — as a
 * reliability diagram and table, with what it does and does not show.
 */
export function sectionCalibration(d: ReportData): string {
  const fit = d.modelFile.fit;
  const head = '<section id="calibration" aria-labelledby="calibration-h"><h2 id="calibration-h">Forecast calibration</h2>';
  const limits =
    '<p>What it does not show: it checks the model\'s forecasts of <em>readings</em>, not of <em>positions</em>. ' +
    'No run carries true positions, so nothing here tests whether <code>likely_p</code> or <code>path_p</code> are right about cells: ' +
    'a model can forecast readings well while placing the robot in the wrong one of two look-alike cells. ' +
    'A large error here is a warning that the model does not describe the runs; a small one is necessary for trustworthy position probabilities, not sufficient.</p>';
  const cal = fit?.predictiveCalibration;
  if (!cal) {
    const why = !fit ? 'This model has no fit record.' : 'This fit held no runs out (or predates the check), so there is nothing to check the forecasts on.';
    return `${head}<p>${why}</p>${limits}</section>`;
  }
  const table = htmlTable(
    [
      { header: 'forecast probability', text: (b: ReliabilityBin) => `${formatNumber(b.lower, 'g')}–${formatNumber(b.upper, 'g')}` },
      { header: 'forecasts', text: (b) => formatNumber(b.count, 'int'), numeric: true },
      { header: 'mean forecast', text: (b) => formatNumber(b.meanPredicted, 'p'), numeric: true },
      { header: 'came true', text: (b) => formatNumber(b.observed, 'p'), numeric: true },
    ],
    cal.bins.filter((b) => b.count > 0),
  );
  return (
    head +
    '<p class="lede">A check that needs no labels. At every step of the held-out runs, the chosen restart\'s model (before the final pass, ' +
    'so it has not seen these runs) forecasts the next reading from the readings before it. Its most likely reading is a forecast ' +
    '"this reading comes, with probability p"; forecasts are grouped by p and compared with how often they came true. ' +
    `Expected calibration error: <strong>${formatNumber(cal.ece, 'p')}</strong> over ${formatNumber(cal.nReadings, 'int')} held-out readings ` +
    '(the forecast-weighted mean distance from the diagonal; 0 is perfect). On runs simulated from the model itself it stays below 0.01.</p>' +
    '<div class="chart-row">' +
    `<figure>${svgReliabilityChart(cal.bins)}<figcaption>Mean forecast against the share that came true, one circle per group of forecasts (area: how many); a calibrated model follows the dashed diagonal.</figcaption></figure>` +
    '</div>' +
    table +
    limits +
    '</section>'
  );
}
