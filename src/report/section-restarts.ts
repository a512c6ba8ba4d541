import type { ReportData } from './report-data.js';
import type { LoopRecord } from '../fit/fit-record.js';
import { svgRestartsChart } from './svg-restarts-chart.js';
import { svgConvergenceChart } from './svg-convergence-chart.js';
import { htmlTable } from './html-table.js';
import { formatNumber } from './format-number.js';
import { restartSpreadNote } from './restart-spread-note.js';

/** Section 3: every restart's training and held-out scores, the chosen one marked, and convergence curves. */
export function sectionRestarts(d: ReportData): string {
  const fit = d.modelFile.fit;
  const head = '<section id="restarts" aria-labelledby="restarts-h"><h2 id="restarts-h">Restarts</h2>';
  if (!fit || fit.restarts.length === 0) {
    return `${head}<p>This model has no fit record, so there are no restarts to compare.</p></section>`;
  }
  const rows: Array<{ label: string; r: LoopRecord; chosen: boolean }> = fit.restarts.map((r, k) => ({ label: String(k + 1), r, chosen: k === fit.selected }));
  if (fit.finalPass) rows.push({ label: 'final pass', r: fit.finalPass, chosen: false });
  const byMode = fit.restarts.some((r) => r.mode !== undefined);
  const table = htmlTable(
    [
      { header: 'restart', text: (x) => (x.chosen ? `${x.label} ★ chosen` : x.label) },
      ...(byMode ? [{ header: 'transitions', text: (x: { r: LoopRecord }) => x.r.mode ?? '' }] : []),
      { header: 'seed', text: (x) => String(x.r.seed), numeric: true },
      { header: 'iterations', text: (x) => String(x.r.iterations), numeric: true },
      { header: 'stop', text: (x) => x.r.stopReason },
      { header: 'training log-lik / reading', text: (x) => formatNumber(x.r.trainLogLikPerReading, 'll'), numeric: true },
      { header: 'held-out log-lik / reading', text: (x) => formatNumber(x.r.heldOutLogLikPerReading, 'll'), numeric: true },
    ],
    rows,
  );
  const by = fit.selectedBy === 'held-out'
    ? 'The chosen restart has the best log-likelihood per reading on the held-out runs — the runs no restart was fitted on — so it is the one expected to describe new runs best.'
    : 'No runs were held out, so the restart with the best training log-likelihood per reading was chosen.';
  const autoNote = byMode
    ? ` With transitions <code>auto</code>, the restarts were shared out among the transition modes (${[...new Set(fit.restarts.map((r) => r.mode))].join(', ')}) and the same rule chose among all of them: the chosen mode is <strong>${fit.restarts[fit.selected].mode}</strong>.`
    : '';
  const finalNote = fit.finalPass ? ' The final pass continues the chosen restart on all runs (dashed); its training score counts every run.' : '';
  return (
    head +
    `<p class="lede">Each restart is EM from a different random start. ${by}${autoNote}${finalNote}</p>` +
    `<p class="caption">${restartSpreadNote(fit)}</p>` +
    '<div class="chart-row">' +
    `<figure>${svgRestartsChart(fit.restarts, fit.selected)}<figcaption>Training against held-out log-likelihood per reading (higher is better); the diamond is the chosen restart.</figcaption></figure>` +
    `<figure>${svgConvergenceChart(fit.restarts, fit.selected, fit.finalPass, 'conv')}<figcaption>EM objective per reading (log-likelihood plus survey prior) at each iteration. Every curve should rise and flatten.</figcaption></figure>` +
    '</div>' +
    table +
    '</section>'
  );
}
