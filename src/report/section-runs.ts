import type { ReportData, RunRow } from './report-data.js';
import { svgRunsChart, SPLIT_MARKS } from './svg-runs-chart.js';
import { htmlSwatchLegend } from './html-swatch-legend.js';
import { htmlTable, type TableColumn } from './html-table.js';
import { formatNumber } from './format-number.js';
import { lowConfidenceShare } from './low-confidence-share.js';
import { escapeHtml } from './escape-html.js';

const WORST = 10;

/**
 * Section 6: every run placed by log-likelihood per reading and low-confidence share, and the worst runs
 * by each — candidates for sensor faults or unmapped changes — with their surprising steps.
 */
export function sectionRuns(d: ReportData): string {
  const head = '<section id="runs" aria-labelledby="runs-h"><h2 id="runs-h">Runs</h2>';
  const rows = d.runRows;
  if (!rows || rows.length === 0) {
    return `${head}<p>No run summary or annotated table was given, so there are no runs to rank. Pass <code>--summary</code> or <code>--annotated</code> (from <code>decode</code>).</p></section>`;
  }
  const byLoglik = rows.filter((r) => Number.isFinite(r.loglikPerReading)).sort((a, b) => a.loglikPerReading - b.loglikPerReading || cmp(a.run, b.run)).slice(0, WORST);
  const byLow = rows.filter((r) => Number.isFinite(lowConfidenceShare(r))).sort((a, b) => lowConfidenceShare(b) - lowConfidenceShare(a) || cmp(a.run, b.run)).slice(0, WORST);
  const impossible = rows.filter((r) => !Number.isFinite(r.loglikPerReading) && r.steps > r.dropouts);
  const columns: TableColumn<RunRow>[] = [
    { header: 'run', text: (r) => r.run },
    { header: 'split', text: (r) => r.split || '–' },
    { header: 'steps', text: (r) => formatNumber(r.steps, 'int'), numeric: true },
    { header: 'dropouts', text: (r) => formatNumber(r.dropouts, 'int'), numeric: true },
    { header: 'log-lik / reading', text: (r) => formatNumber(r.loglikPerReading, 'll'), numeric: true },
    { header: 'low-confidence', text: (r) => formatNumber(lowConfidenceShare(r), 'pct'), numeric: true },
    { header: 'surprising steps', text: (r) => formatNumber(r.surprisingSteps, 'int'), numeric: true },
    { header: 'mean path posterior', text: (r) => formatNumber(r.meanPathP, 'p'), numeric: true },
  ];
  const labelled = new Set(byLoglik.slice(0, 3).map((r) => r.run));
  const splits = new Set(rows.map((r) => (SPLIT_MARKS[r.split] ? r.split : 'other')));
  const legend = htmlSwatchLegend(
    Object.entries(SPLIT_MARKS)
      .filter(([k]) => splits.has(k))
      .map(([, v]) => ({ colour: v.colour, label: v.label, mark: v.shape === 'circle' ? 'dot' : v.shape === 'diamond' ? 'diamond' : undefined })),
    'split',
  );
  const source = d.runRowsFrom === 'summary' ? 'the run summary table' : 'the annotated table (summed per run)';
  const totalSurprising = rows.reduce((s, r) => s + r.surprisingSteps, 0);
  return (
    head +
    `<p class="lede">${rows.length} runs from ${source}, ${formatNumber(totalSurprising, 'int')} surprising steps in all. Runs far to the left read things the model finds unlikely (a sensor fault, an unmapped change, a robot somewhere the floor graph does not know); runs high up could not be placed with confidence. The three lowest-scoring runs are named.</p>` +
    `<figure>${svgRunsChart(rows, labelled)}<figcaption>One mark per run; the larger the mark, the more surprising steps the run has.</figcaption></figure>` +
    legend +
    (impossible.length ? `<p class="warning">${impossible.length} run${impossible.length === 1 ? ' is' : 's are'} impossible under the model (probability zero) and could not be decoded: ${impossible.slice(0, 10).map((r) => `<code>${escapeHtml(r.run)}</code>`).join(', ')}.</p>` : '') +
    '<div class="table-row">' +
    `<div><h3>Lowest log-likelihood per reading</h3>${htmlTable(columns, byLoglik)}</div>` +
    `<div><h3>Highest share of low-confidence steps</h3>${htmlTable(columns, byLow)}</div>` +
    '</div></section>'
  );
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
