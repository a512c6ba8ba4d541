import type { ReportData } from './report-data.js';
import { escapeHtml } from './escape-html.js';
import { htmlCard } from './html-card.js';
import { formatNumber } from './format-number.js';
import { SAFETY_CAUTION } from './safety-caution.js';

interface Card {
  label: string;
  value: string;
  detail?: string;
}

/** Section 1: the building, the data, the chosen restart and its scores, the safety caution. */
export function sectionSummary(d: ReportData): string {
  const { model, fit } = d.modelFile;
  const g = d.geometry;
  const nOneway = g.links.filter((l) => l.oneway).length + g.crossLinks.filter((l) => l.oneway).length;
  const nLinks = g.links.length + g.crossLinks.length;
  const cards: Card[] = [
    { label: 'cells', value: formatNumber(model.cells.length, 'int'), detail: `${g.levels.length} level${g.levels.length === 1 ? '' : 's'}, ${nLinks} links (${nOneway} one-way), ${model.surfaces.length} surfaces` },
  ];
  const nRuns = fit ? fit.split.fit.length + fit.split.heldOut.length : d.runRows?.length ?? null;
  if (nRuns !== null) {
    cards.push({ label: 'runs', value: formatNumber(nRuns, 'int'), detail: fit ? `${fit.split.fit.length} fitted on, ${fit.split.heldOut.length} held out` : 'in the run table' });
  }
  const nReadings = fit ? fit.nReadings.fit + fit.nReadings.heldOut : d.nAnnotatedReadings;
  if (nReadings !== null) {
    cards.push({ label: 'readings', value: formatNumber(nReadings, 'int'), detail: fit ? `${formatNumber(fit.nReadings.fit, 'int')} fitted on, ${formatNumber(fit.nReadings.heldOut, 'int')} held out` : 'in the annotated table' });
  }
  if (fit?.restarts.length) {
    const chosen = fit.restarts[fit.selected];
    cards.push({ label: 'restarts', value: String(fit.restarts.length), detail: `chosen: restart ${fit.selected + 1} (seed ${chosen.seed}), by ${fit.selectedBy} score` });
    cards.push({ label: 'held-out log-likelihood / reading', value: formatNumber(chosen.heldOutLogLikPerReading, 'll'), detail: 'chosen restart, runs it never saw' });
    cards.push({ label: 'training log-likelihood / reading', value: formatNumber(chosen.trainLogLikPerReading, 'll'), detail: 'chosen restart, runs it was fitted on' });
    const finalIt = fit.finalPass ? fit.finalPass.iterations : 0;
    cards.push({
      label: 'iterations',
      value: String(chosen.iterations + finalIt),
      detail: `${chosen.iterations} in the chosen restart (${chosen.stopReason})${fit.finalPass ? ` + ${finalIt} in the final pass on all runs (${fit.finalPass.stopReason})` : ''}`,
    });
  }
  const amb = d.ambiguity;
  const rated = countWhere(amb.visits, (v) => v >= amb.options.minVisits);
  const ambiguous = amb.ambiguous.reduce((a, b) => a + b, 0);
  if (rated > 0) {
    cards.push({ label: 'ambiguous cells', value: `${formatNumber(ambiguous / rated, 'pct')}`, detail: `${ambiguous} of ${rated} rated cells are recovered less than ${formatNumber(amb.options.threshold, 'pct')} of the time (simulated)` });
  }
  if (d.changes) {
    const changed = (d.changeRows ?? []).filter((c) => c.verdict === 'changed').length;
    cards.push({ label: 'changed cells', value: String(changed), detail: `of ${(d.changeRows ?? []).length} cells in the changes table` });
  }
  const html = cards.map((c) => htmlCard(c.label, c.value, c.detail)).join('');
  const opts = fit?.options;
  const how = fit && opts
    ? `Fitted by ${fit.tool} ${fit.toolVersion}: ${opts.restarts} restarts, transitions ${opts.transitions}${opts.transitions === 'auto' && fit.restarts[fit.selected]?.mode ? ` (chose ${fit.restarts[fit.selected].mode})` : ''}${opts.transitionPriorStrength !== undefined ? ` with transition prior strength ${opts.transitionPriorStrength}` : ''}, survey prior hit ${opts.hit} with strength ${opts.priorStrength}, ${opts.holdoutCol ? `held-out runs marked in column ${opts.holdoutCol}` : `${formatNumber(opts.holdout, 'pct')} of runs held out`}, seed ${opts.seed}, tolerance ${opts.tol}, at most ${opts.maxIter} iterations.`
    : 'This model has no fit record: it was not calibrated by underfoot fit (for example a simulation truth or a hand-made model), so there are no restarts or scores to show.';
  const notes = d.notes.length ? `<ul class="notes">${d.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join('')}</ul>` : '';
  return (
    '<section id="summary" aria-labelledby="summary-h">' +
    '<h2 id="summary-h">Summary</h2>' +
    `<div class="cards">${html}</div>` +
    `<p class="how">${escapeHtml(how)}</p>` +
    `<div class="caution" role="note"><strong>Safety.</strong> ${escapeHtml(SAFETY_CAUTION)}</div>` +
    notes +
    '</section>'
  );
}

function countWhere(a: ArrayLike<number>, ok: (v: number) => boolean): number {
  let n = 0;
  for (let i = 0; i < a.length; i++) if (ok(a[i])) n++;
  return n;
}
