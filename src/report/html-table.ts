import { escapeHtml } from './escape-html.js';

export interface TableColumn<T> {
  /** Plain-text header. */
  header: string;
  /** Plain text of the cell (escaped here). */
  text(row: T): string;
  /** Right-aligned, tabular figures. */
  numeric?: boolean;
  /** Optional swatch colour shown before the text. */
  swatch?(row: T): string | null;
}

/** An HTML table; every header and cell text is escaped. */
export function htmlTable<T>(columns: TableColumn<T>[], rows: T[], className = 'data'): string {
  const head = columns.map((c) => `<th${c.numeric ? ' class="num"' : ''} scope="col">${escapeHtml(c.header)}</th>`).join('');
  const body = rows
    .map(
      (row) =>
        '<tr>' +
        columns
          .map((c) => {
            const colour = c.swatch?.(row) ?? null;
            const swatch = colour ? `<span class="swatch swatch-inline" style="--swatch:${colour}"></span>` : '';
            return `<td${c.numeric ? ' class="num"' : ''}>${swatch}${escapeHtml(c.text(row))}</td>`;
          })
          .join('') +
        '</tr>',
    )
    .join('');
  return `<div class="table-wrap"><table class="${className}"><thead><tr>${head}</tr></thead><tbody>${body}</tbody></table></div>`;
}
