/** The page's style sheet, inlined into the report (no external CSS or fonts). */
import { FONT, PALETTE } from './chart-theme.ts';

export const REPORT_CSS = `
:root { --ink: ${PALETTE.ink}; --muted: ${PALETTE.muted}; --line: #d9dee5; --soft: #f4f6f8; --accent: ${PALETTE.median}; --warn: #8a5a00; }
* { box-sizing: border-box; }
html { background: #eef1f4; }
body { margin: 0; font-family: ${FONT}; font-size: 14px; line-height: 1.45; color: var(--ink); }
main { max-width: 1280px; margin: 0 auto; padding: 24px 28px 40px; }
header.top { background: #ffffff; border-bottom: 1px solid var(--line); }
header.top .inner { max-width: 1280px; margin: 0 auto; padding: 22px 28px 16px; }
h1 { font-size: 22px; margin: 0 0 6px; font-weight: 650; letter-spacing: -0.01em; }
h2 { font-size: 18px; margin: 0 0 12px; font-weight: 650; }
h3 { font-size: 14px; margin: 20px 0 8px; font-weight: 650; color: var(--ink); text-transform: none; }
.meta { color: var(--muted); font-size: 12.5px; margin: 0; }
.meta span + span::before { content: " · "; }
.caution { margin: 18px 0; padding: 12px 16px; background: #fff8e6; border: 1px solid #e8cf8f; border-left: 5px solid #c98a00; border-radius: 4px; font-size: 14px; }
.caution strong { display: block; font-size: 12px; letter-spacing: 0.06em; text-transform: uppercase; color: var(--warn); margin-bottom: 2px; }
.block { background: #ffffff; border: 1px solid var(--line); border-radius: 6px; padding: 18px 22px 20px; margin: 18px 0; }
.cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(140px, 1fr)); gap: 10px; margin: 0 0 14px; }
.card { background: var(--soft); border: 1px solid var(--line); border-radius: 5px; padding: 8px 12px; }
.card .value { font-size: 20px; font-weight: 650; font-variant-numeric: tabular-nums; }
.card .label { font-size: 12px; color: var(--muted); }
.lead { color: var(--muted); margin: 0 0 8px; }
nav.toc ol { margin: 4px 0 0; padding-left: 20px; columns: 2; column-gap: 32px; }
nav.toc a { color: var(--accent); text-decoration: none; }
nav.toc a:hover { text-decoration: underline; }
.group-head { display: flex; align-items: baseline; justify-content: space-between; gap: 12px; flex-wrap: wrap; }
.group-head .n { color: var(--muted); font-size: 13px; }
.curve-row { display: grid; grid-template-columns: minmax(0, 2.2fr) minmax(220px, 1fr); gap: 18px; align-items: start; }
.two-col { display: grid; grid-template-columns: minmax(0, 1fr) minmax(0, 1fr); gap: 24px; align-items: start; }
.nowrap { white-space: nowrap; }
.side h3:first-child { margin-top: 4px; }
figure { margin: 0; }
figure svg { display: block; max-width: 100%; height: auto; }
figcaption { font-size: 12px; color: var(--muted); margin-top: 4px; }
.hist-grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(300px, 1fr)); gap: 14px 18px; margin-top: 8px; }
.cc-grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(540px, 1fr)); gap: 18px; margin-top: 8px; }
.chart { border: 1px solid #e6e9ee; border-radius: 4px; padding: 8px; background: #ffffff; }
.table-wrap { overflow-x: auto; }
table { border-collapse: collapse; width: 100%; font-size: 12.5px; }
table.chars { width: auto; }
table.chars td.num, table.chars th.num { min-width: 110px; }
caption { text-align: left; color: var(--muted); padding-bottom: 4px; }
th, td { padding: 5px 7px; border-bottom: 1px solid #e6e9ee; text-align: left; vertical-align: top; }
thead th { background: var(--soft); font-weight: 600; border-bottom: 1px solid var(--line); vertical-align: bottom; }
.th-note { display: block; font-weight: 400; color: var(--muted); font-size: 11px; }
tbody tr:nth-child(even) td { background: #fafbfc; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.char { font-weight: 600; color: ${PALETTE.characteristic}; }
td.char.headline { box-shadow: inset 0 0 0 1.5px ${PALETTE.characteristic}; border-radius: 3px; }
td.warn { color: var(--warn); }
.unit { color: var(--muted); }
ul.warnings { margin: 6px 0 0; padding-left: 18px; color: var(--warn); font-size: 12.5px; }
.mono { font-family: ui-monospace, "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 12px; }
.empty { color: var(--muted); font-style: italic; margin: 4px 0; }
.truncated { color: var(--warn); font-size: 12.5px; margin: 6px 0 0; }
dl.kv { display: grid; grid-template-columns: max-content 1fr; gap: 2px 12px; margin: 0; font-size: 12.5px; }
dl.kv dt { color: var(--muted); }
dl.kv .kv-line { display: block; }
dl.kv dd { margin: 0; font-variant-numeric: tabular-nums; overflow-wrap: anywhere; }
.side h4 { font-size: 12.5px; margin: 10px 0 3px; }
.side details.provenance { margin-top: 10px; font-size: 12.5px; }
table.compact td, table.compact th { padding: 1px 6px; font-size: 12px; }
footer { max-width: 1280px; margin: 0 auto; padding: 0 28px 32px; color: var(--muted); font-size: 12px; }
@media (max-width: 900px) { .curve-row, .two-col { grid-template-columns: 1fr; } nav.toc ol { columns: 1; } }
@media print {
  html { background: #ffffff; }
  main { padding: 0; }
  .block { border: none; padding: 0; break-inside: auto; }
  figure, table { break-inside: avoid; }
}
`;
