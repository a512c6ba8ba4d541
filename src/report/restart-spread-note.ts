import type { FitRecord } from '../fit/fit-record.js';
import { formatNumber } from './format-number.js';

/**
 * One sentence that says how far apart the restarts' scores are, so that a chart whose axis spans a few
 * ten-thousandths does not make small differences look large: the spread per reading, and what it is in
 * log-likelihood units over all held-out (or training) readings. Empty with fewer than two restarts.
 */
export function restartSpreadNote(fit: FitRecord): string {
  if (fit.restarts.length < 2) return '';
  const heldOut = fit.restarts.every((r) => r.heldOutLogLikPerReading !== null);
  const scores = fit.restarts.map((r) => (heldOut ? (r.heldOutLogLikPerReading as number) : r.trainLogLikPerReading));
  const spread = Math.max(...scores) - Math.min(...scores);
  const readings = heldOut ? fit.nReadings.heldOut : fit.nReadings.fit;
  const which = heldOut ? 'held-out' : 'training';
  return (
    `Read the axes with care: the restarts' ${which} scores lie within ${formatNumber(spread, 'g')} per reading of each other` +
    `${spread < 1e-2 ? ' (a narrow range, drawn large)' : ''}; over the ${readings.toLocaleString('en-GB')} ${which} readings that is ` +
    `${formatNumber(spread * readings, 'g')} log-likelihood units between the best and the worst.`
  );
}
