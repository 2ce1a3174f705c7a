/**
 * The stylesheet inlined into every kerrtrace HTML report: white paper, dark ink, one blue
 * accent and a vermillion for cautions (both from the Okabe–Ito palette), tabular figures for
 * numbers, and print rules (A4/Letter margins, each section on a new page, nothing split across
 * pages that should not be, no backgrounds needed to read anything).
 * @example REPORT_CSS.includes('@media print') === true
 */
export const REPORT_CSS = `
:root {
  --ink: #1d2433; --muted: #5b6475; --rule: #d6dae1; --faint: #eef1f5;
  --accent: #0072B2; --caution: #D55E00; --ok: #009E73; --paper: #ffffff;
}
* { box-sizing: border-box; }
html { background: var(--paper); }
body {
  margin: 0; color: var(--ink); background: var(--paper);
  font: 15px/1.55 system-ui, -apple-system, "Segoe UI", Roboto, "DejaVu Sans", Helvetica, Arial, sans-serif;
  -webkit-print-color-adjust: exact; print-color-adjust: exact;
}
main { max-width: 1000px; margin: 0 auto; padding: 28px 32px 56px; }
a { color: var(--accent); }
code, .mono { font-family: ui-monospace, "SFMono-Regular", "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 12.5px; }
.hash { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 11.5px; word-break: break-all; color: var(--muted); }

.masthead { display: flex; justify-content: space-between; align-items: flex-end; gap: 24px;
  border-bottom: 3px solid var(--ink); padding-bottom: 14px; }
.masthead .kicker { font-size: 11.5px; font-weight: 700; letter-spacing: .14em; text-transform: uppercase; color: var(--accent); }
.masthead h1 { font-size: 27px; line-height: 1.2; margin: 4px 0 0; font-weight: 700; overflow-wrap: anywhere; }
.masthead .meta { text-align: right; font-size: 12.5px; color: var(--muted); white-space: nowrap; }
.masthead .meta div { margin-top: 2px; }

nav.toc { margin: 14px 0 0; font-size: 13px; color: var(--muted); display: flex; flex-wrap: wrap; gap: 4px 16px; }
nav.toc a { color: var(--muted); text-decoration: none; border-bottom: 1px dotted var(--rule); }
nav.toc a:hover { color: var(--accent); }

section { margin-top: 38px; }
section > h2 { font-size: 18px; margin: 0 0 14px; padding-bottom: 6px; border-bottom: 1px solid var(--rule);
  display: flex; align-items: baseline; gap: 10px; }
section > h2 .no { color: var(--accent); font-variant-numeric: tabular-nums; font-size: 14px; font-weight: 700; min-width: 1.6em; }
h3 { font-size: 14.5px; margin: 22px 0 8px; }
p { margin: 8px 0; }
.lead { color: var(--muted); margin-top: 0; }

.cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(215px, 1fr)); gap: 12px; }
.card { border: 1px solid var(--rule); border-top: 4px solid var(--accent); padding: 10px 13px 11px; background: var(--paper); break-inside: avoid; }
.card .name { font-size: 11.5px; letter-spacing: .06em; text-transform: uppercase; color: var(--muted); font-weight: 600; }
.card .value { font-size: 19px; font-weight: 650; font-variant-numeric: tabular-nums; margin-top: 3px; overflow-wrap: anywhere; }
.card .unit { font-size: 13px; font-weight: 600; color: var(--ink); margin-top: 1px; }
.card .note { font-size: 12px; color: var(--muted); margin-top: 3px; }
.card.withheld { border-top-color: var(--caution); }
.card.withheld .value { font-size: 15px; color: var(--caution); }
.card.minor { border-top-color: #9aa3b2; }

.callout { border: 1px solid var(--caution); border-left-width: 5px; padding: 10px 14px; margin: 14px 0; break-inside: avoid; }
.callout.note { border-color: var(--rule); border-left-color: var(--accent); }
.callout strong:first-child { display: block; margin-bottom: 2px; }

ol.warnings { list-style: none; padding: 0; margin: 0; counter-reset: w; }
ol.warnings li { counter-increment: w; position: relative; border-bottom: 1px solid var(--faint); padding: 9px 0 9px 40px; break-inside: avoid; }
ol.warnings li::before { content: "!"; position: absolute; left: 4px; top: 10px; width: 22px; height: 22px; border: 2px solid var(--caution);
  border-radius: 50%; color: var(--caution); font-weight: 800; font-size: 13px; line-height: 18px; text-align: center; }
ol.warnings .code { font-size: 11.5px; color: var(--muted); }
ol.warnings .advice { font-size: 13px; color: var(--muted); margin-top: 3px; }
ol.warnings .advice em { font-style: normal; font-weight: 600; color: var(--ink); }
.none { color: var(--muted); font-style: italic; }

table { border-collapse: collapse; width: 100%; font-size: 13px; margin: 6px 0 12px; }
th, td { text-align: left; padding: 5px 9px 5px 0; border-bottom: 1px solid var(--faint); vertical-align: top; }
th { font-size: 11.5px; text-transform: uppercase; letter-spacing: .05em; color: var(--muted); font-weight: 600; border-bottom: 1.5px solid var(--rule); }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; padding-right: 12px; white-space: nowrap; }
th.run { text-transform: none; letter-spacing: 0; font-size: 12.5px; color: var(--ink); }
table.changes tr.pair th { text-transform: none; letter-spacing: 0; font-size: 13px; color: var(--ink); padding-top: 12px; overflow-wrap: anywhere; }
td.wrap { overflow-wrap: anywhere; }
table.kv td, table.kv td.num { text-align: left; padding-right: 0; }
table.options td:first-child { width: 40%; }
table.kv th { width: 46%; text-transform: none; letter-spacing: 0; font-size: 13px; color: var(--ink); border-bottom: 1px solid var(--faint); font-weight: 600; }
.pill { display: inline-block; white-space: nowrap; padding: 0 7px; border: 1px solid currentColor; border-radius: 9px; font-size: 11.5px; font-weight: 600; }
.pill.up { color: var(--accent); } .pill.down { color: var(--caution); } .pill.same { color: var(--muted); }
.columns { display: grid; grid-template-columns: 1fr 1fr; gap: 0 28px; }

figure { margin: 14px 0 18px; break-inside: avoid; }
figure .plot svg { max-width: 100%; height: auto; display: block; }
figure img { width: 100%; height: auto; display: block; }
figure[data-image="frame"] img { width: min(100%, 640px); }
figure img { border: 1px solid var(--rule); image-rendering: auto; }
figcaption { font-size: 12.5px; color: var(--muted); margin-top: 6px; max-width: 760px; }
figcaption b { color: var(--ink); }
.images { display: grid; grid-template-columns: repeat(auto-fit, minmax(280px, 1fr)); gap: 16px; }
.missing { border: 1.5px dashed var(--rule); padding: 26px 14px; text-align: center; color: var(--muted); font-size: 13px; }

.safety { border: 2px solid var(--ink); padding: 4px 18px 12px; }
.safety dl { margin: 6px 0; display: grid; grid-template-columns: 210px 1fr; gap: 6px 16px; }
.safety dt { font-weight: 700; }
.safety dd { margin: 0; }
.safety .defer { font-weight: 600; border-top: 1px solid var(--rule); padding-top: 8px; margin-top: 10px; }

.plot-grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(290px, 1fr)); gap: 8px 20px; }
.plot-grid figure { margin: 6px 0; }
.plot-grid figure .plot svg { width: 100%; }
ul.verdicts { list-style: none; margin: 6px 0 0; padding: 0; }
ul.verdicts li { margin: 0; padding: 6px 0; border-bottom: 1px solid var(--faint); display: grid; grid-template-columns: 150px 1fr; gap: 12px; align-items: baseline; }
ul.verdicts .pill { justify-self: start; }
table.runs { font-size: 12px; }
table.budget th, table.budget td { text-align: left; padding-right: 10px; vertical-align: top; }
table.budget td:last-child { width: 40%; }
table.runs td { padding-right: 8px; }

footer { margin-top: 44px; padding-top: 10px; border-top: 1px solid var(--rule); font-size: 12px; color: var(--muted); }

@media (max-width: 700px) {
  main { padding: 18px 14px 40px; }
  .masthead { flex-direction: column; align-items: flex-start; }
  .masthead .meta { text-align: left; }
  .columns { grid-template-columns: 1fr; }
  .safety dl { grid-template-columns: 1fr; }
}
@media print {
  @page { margin: 15mm 14mm; }
  body { font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  nav.toc { display: none; }
  section { break-before: page; margin-top: 0; padding-top: 2mm; }
  section.first { break-before: auto; margin-top: 8mm; }
  h2, h3 { break-after: avoid; }
  tr, .card, figure, .callout { break-inside: avoid; }
  a { color: var(--ink); }
  .card .value { font-size: 15pt; }
}
`;
