import { INK, MUTED_INK } from './palette.js';

/** Every overlay key of the page (floor map and ambiguity maps); each gets its radio-button rules. */
const OVERLAY_KEYS = ['surface', 'visits', 'confidence', 'changes', 'recovery', 'zone-recovery', 'error'];

/**
 * The report's style sheet (inline: the page loads nothing). System fonts only. Overlays are switched
 * by radio buttons and the `:checked` selector, so the page works without script.
 */
export const REPORT_STYLE = `
:root { --ink: ${INK}; --muted: ${MUTED_INK}; --paper: #fbfaf6; --card: #ffffff; --rule: #e4e0d5; --accent: #2f5d8c; --warn: #8c3957; }
* { box-sizing: border-box; }
html { background: var(--paper); }
body { margin: 0; color: var(--ink); font: 15px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Liberation Sans", "DejaVu Sans", Arial, sans-serif; }
header.top { background: #1f3350; color: #f4f1e8; padding: 26px 32px 18px; }
header.top .kicker { text-transform: uppercase; letter-spacing: 0.12em; font-size: 12px; opacity: 0.8; margin: 0 0 4px; }
header.top h1 { margin: 0; font-size: 28px; line-height: 1.2; font-weight: 650; }
header.top p.sub { margin: 6px 0 0; opacity: 0.85; font-size: 14px; }
nav.toc { display: flex; flex-wrap: wrap; gap: 6px 18px; margin-top: 14px; font-size: 14px; }
nav.toc a { color: #f4f1e8; text-decoration: none; border-bottom: 1px solid rgba(244,241,232,0.4); }
nav.toc a:hover, nav.toc a:focus-visible { border-bottom-color: #f4f1e8; }
main { max-width: 1240px; margin: 0 auto; padding: 18px 24px 40px; }
section { background: var(--card); border: 1px solid var(--rule); border-radius: 10px; padding: 18px 24px 22px; margin: 18px 0; }
h2 { font-size: 21px; margin: 0 0 6px; }
h3 { font-size: 16px; margin: 20px 0 6px; }
p.lede { color: #3c4753; max-width: 80ch; margin: 0 0 12px; }
p.caption { color: var(--muted); font-size: 13px; margin: 0 0 6px; max-width: 90ch; }
p.how { color: var(--muted); font-size: 13px; max-width: 100ch; }
p.more { color: var(--muted); font-size: 13px; }
p.warning { color: var(--warn); }
code { font-family: "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 0.92em; background: #f1eee5; padding: 0 3px; border-radius: 3px; }
.cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(190px, 1fr)); gap: 10px; margin: 10px 0 12px; }
.card { border: 1px solid var(--rule); border-radius: 8px; padding: 10px 12px; background: #fdfcf9; }
.card-label { font-size: 12px; color: var(--muted); text-transform: uppercase; letter-spacing: 0.05em; }
.card-value { font-size: 24px; font-weight: 650; font-variant-numeric: tabular-nums; margin: 2px 0; overflow-wrap: anywhere; }
.card-detail { font-size: 12.5px; color: #4a5561; }
.cards.compact .card-value { font-size: 20px; }
.caution { border-left: 5px solid var(--warn); background: #f8eef1; padding: 10px 14px; border-radius: 4px; margin: 12px 0 4px; max-width: 100ch; }
ul.notes { color: var(--warn); font-size: 13.5px; }
figure { margin: 8px 0; }
figcaption { font-size: 13px; color: var(--muted); margin: 2px 0 4px; }
.level-map figcaption { font-weight: 600; color: var(--ink); font-size: 14px; }
svg { display: block; max-width: 100%; height: auto; font-family: inherit; }
figure.wide { overflow-x: auto; }
figure.wide svg { max-width: none; }
.chart-row, .maps { display: flex; flex-wrap: wrap; gap: 10px 28px; align-items: flex-start; }
.chart-row > figure { flex: 0 1 auto; max-width: 540px; min-width: 0; }
.chart-row > div, .maps > * { min-width: 0; max-width: 100%; }
.legend-row { display: flex; flex-wrap: wrap; gap: 8px 28px; align-items: center; margin: 4px 0 8px; }
.table-row { display: flex; flex-direction: column; gap: 4px; }
.table-wrap { overflow-x: auto; max-width: 100%; }
table.data { border-collapse: collapse; font-size: 13.5px; margin: 6px 0 8px; }
table.data th, table.data td { padding: 4px 10px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; overflow-wrap: normal; word-break: normal; hyphens: none; }
table.data td { white-space: nowrap; }
table.data th { font-size: 12px; color: var(--muted); font-weight: 600; text-transform: uppercase; letter-spacing: 0.03em; border-bottom: 2px solid var(--rule); }
table.data td.num, table.data th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
table.data tbody tr:nth-child(even) { background: #faf8f2; }
.swatch-legend { display: flex; flex-wrap: wrap; gap: 6px 16px; align-items: center; font-size: 13px; margin: 6px 0; }
.legend-caption { font-weight: 600; margin-right: 4px; }
.swatch-item { display: inline-flex; align-items: center; gap: 6px; }
.swatch { display: inline-block; width: 14px; height: 14px; border-radius: 3px; background: var(--swatch); flex: none; }
.swatch-inline { margin-right: 6px; vertical-align: -2px; width: 11px; height: 11px; }
.swatch-hatch { background: repeating-linear-gradient(45deg, rgba(36,48,61,0.65) 0 1.5px, transparent 1.5px 4px), var(--swatch); }
.swatch-light-hatch { background: repeating-linear-gradient(-45deg, rgba(255,255,255,0.75) 0 1.5px, transparent 1.5px 4px), var(--swatch); }
.swatch-dashed { border: 1px dashed var(--muted); }
.swatch-outline { background: transparent; border: 2px solid var(--swatch); }
.swatch-line { height: 4px; border-radius: 2px; width: 20px; }
.swatch-arrow { background: transparent; width: 20px; height: 10px; position: relative; }
.swatch-arrow::before { content: ""; position: absolute; left: 0; right: 5px; top: 4px; height: 2px; background: var(--swatch); }
.swatch-arrow::after { content: ""; position: absolute; right: 0; top: 1px; border-left: 7px solid var(--swatch); border-top: 4px solid transparent; border-bottom: 4px solid transparent; }
.swatch-dot { border-radius: 50%; width: 10px; height: 10px; }
.swatch-diamond { width: 10px; height: 10px; border-radius: 1px; transform: rotate(45deg); margin: 0 2px; }
.swatch-notch { background: linear-gradient(45deg, var(--swatch) 50%, transparent 50%); border: 1px solid var(--rule); border-radius: 0; }
.swatch-triangle { background: transparent; width: 0; height: 0; border-radius: 0; border-left: 6px solid transparent; border-right: 6px solid transparent; border-bottom: 10px solid var(--swatch); }
.overlays { position: relative; }
.ov-radio { position: absolute; opacity: 0; width: 1px; height: 1px; pointer-events: none; }
.ov-tabs { display: flex; flex-wrap: wrap; gap: 6px; margin: 4px 0 8px; }
.ov-tab { cursor: pointer; padding: 5px 12px; border: 1px solid var(--rule); border-radius: 16px; font-size: 13.5px; background: #f6f3ea; user-select: none; }
.ov-tab:hover { border-color: var(--accent); }
.ov-legend { display: none; min-height: 60px; }
.overlays .layer { display: none; }
${OVERLAY_KEYS.map((k) => `#ov-${k}:checked ~ .maps .layer-${k} { display: inline; }
#ov-${k}:checked ~ .ov-legends .lg-${k} { display: block; }
#ov-${k}:checked ~ .ov-tabs label[for="ov-${k}"] { background: var(--accent); border-color: var(--accent); color: #ffffff; }
#ov-${k}:focus-visible ~ .ov-tabs label[for="ov-${k}"] { outline: 2px solid var(--ink); outline-offset: 2px; }`).join('\n')}
footer { max-width: 1240px; margin: 0 auto; padding: 0 24px 30px; color: var(--muted); font-size: 12.5px; }
footer code { background: none; }
@media print {
  @page { margin: 14mm; }
  html, body { background: #ffffff; font-size: 11pt; }
  header.top { background: #ffffff; color: var(--ink); border-bottom: 2px solid var(--ink); padding: 0 0 8px; }
  nav.toc, .ov-tabs { display: none; }
  main { max-width: none; padding: 0; }
  section { border: none; border-radius: 0; padding: 0; margin: 0 0 14px; }
  h2, h3, figcaption { break-after: avoid-page; }
  figure, .card, .caution, tr { break-inside: avoid-page; }
  .table-wrap, figure.wide { overflow: visible; }
  table.data td { white-space: normal; }
  svg, figure.wide svg { max-width: 100%; }
  table.data tbody tr:nth-child(even), .card, code { background: none; }
}
`;
