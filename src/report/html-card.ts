import { escapeHtml } from './escape-html.js';

/** A key figure: a small label, a large value and an optional line of detail (all plain text). */
export function htmlCard(label: string, value: string, detail?: string): string {
  return `<div class="card"><div class="card-label">${escapeHtml(label)}</div><div class="card-value">${escapeHtml(value)}</div>${detail ? `<div class="card-detail">${escapeHtml(detail)}</div>` : ''}</div>`;
}
