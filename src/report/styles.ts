/** The report's style sheet (our own design): system fonts, light cards, tables with tabular figures, print-friendly. */
export const REPORT_CSS = `
:root { --ink:#1f2430; --muted:#5d6675; --line:#e3e7ed; --paper:#ffffff; --wash:#f5f7fa; --accent:#0072B2;
  --ok:#1b7f4c; --flag:#a15c00; --fail:#b3261e; }
* { box-sizing: border-box; }
html { background: var(--wash); }
body { margin: 0; color: var(--ink); font: 15px/1.5 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; }
main { max-width: 1240px; margin: 0 auto; padding: 28px 28px 64px; }
header.masthead { background: linear-gradient(120deg, #12324a, #1e5a7d); color: #fff; }
header.masthead .inner { max-width: 1240px; margin: 0 auto; padding: 30px 28px 26px; }
header.masthead h1 { margin: 0 0 4px; font-size: 28px; font-weight: 650; letter-spacing: .01em; }
header.masthead p { margin: 0; color: #cfe0ec; font-size: 14px; }
header.masthead code { color: #fff; }
nav.toc { margin-top: 14px; display: flex; flex-wrap: wrap; gap: 6px 18px; font-size: 14px; }
nav.toc a { color: #e6f1f8; text-decoration: none; border-bottom: 1px solid rgba(255,255,255,.35); }
h2 { font-size: 20px; margin: 40px 0 6px; font-weight: 650; }
h3 { font-size: 16px; margin: 0; font-weight: 650; }
p.lead { color: var(--muted); margin: 0 0 14px; max-width: 80ch; }
.cards { display: grid; grid-template-columns: repeat(auto-fit, minmax(170px, 1fr)); gap: 14px; margin: 18px 0 8px; }
.card { background: var(--paper); border: 1px solid var(--line); border-radius: 10px; padding: 14px 16px; }
.card .label { color: var(--muted); font-size: 13px; }
.card .value { font-size: 26px; font-weight: 650; font-variant-numeric: tabular-nums; line-height: 1.25; }
.card .sub { color: var(--muted); font-size: 12.5px; font-variant-numeric: tabular-nums; }
.card.wide { grid-column: span 2; }
.panel { background: var(--paper); border: 1px solid var(--line); border-radius: 10px; padding: 16px 18px; margin: 14px 0; overflow-x: auto; }
.panel svg { max-width: 100%; height: auto; display: block; }
figure { margin: 0; }
figcaption { color: var(--muted); font-size: 13.5px; margin-top: 8px; max-width: 95ch; }
table { border-collapse: collapse; width: 100%; font-size: 14px; font-variant-numeric: tabular-nums; }
th, td { text-align: right; padding: 6px 10px; border-bottom: 1px solid var(--line); white-space: nowrap; }
th:first-child, td:first-child { text-align: left; }
thead th { color: var(--muted); font-weight: 600; font-size: 12.5px; border-bottom: 1.5px solid #cfd5dd; vertical-align: bottom; white-space: normal; }
table.compact th, table.compact td { padding: 6px 7px; font-size: 13.5px; }
tbody tr:nth-child(even) { background: #fafbfc; }
td.text { text-align: left; white-space: normal; }
.badge { display: inline-block; padding: 1px 9px; border-radius: 999px; font-size: 12px; font-weight: 600; letter-spacing: .02em; }
.badge.ok { background: #e3f4ea; color: var(--ok); }
.badge.flagged { background: #fdf0dc; color: var(--flag); }
.badge.failed { background: #fbe4e2; color: var(--fail); }
.toss { background: var(--paper); border: 1px solid var(--line); border-radius: 10px; margin: 18px 0; padding: 16px 18px; }
.toss.flagged { border-left: 5px solid #e6a23c; }
.toss.failed { border-left: 5px solid #d9534f; }
.toss.ok { border-left: 5px solid #59b27e; }
.toss-head { display: flex; flex-wrap: wrap; align-items: baseline; gap: 8px 14px; }
.toss-head .who { color: var(--muted); font-size: 14px; }
.flags { margin: 8px 0 0; padding: 0; list-style: none; font-size: 13.5px; }
.flags li { margin: 2px 0; }
.flags code { background: #fdf0dc; color: #7a4500; padding: 0 5px; border-radius: 4px; }
.error { margin: 10px 0 0; padding: 8px 12px; background: #fbe4e2; color: #7d1a14; border-radius: 6px; font-size: 14px; white-space: pre-wrap; }
dl.values { display: grid; grid-template-columns: repeat(auto-fill, minmax(150px, 1fr)); gap: 6px 16px; margin: 12px 0; }
dl.values div { border-top: 1px solid var(--line); padding-top: 4px; }
dl.values dt { color: var(--muted); font-size: 12px; }
dl.values dd { margin: 0; font-variant-numeric: tabular-nums; font-weight: 600; }
dl.values div.faces { grid-column: span 2; }
dl.values div.faces dd { font-weight: 500; }
.plots { display: flex; flex-wrap: wrap; align-items: flex-start; gap: 14px 26px; margin-top: 6px; }
.plots svg { display: block; max-width: 100%; height: auto; }
.strip { display: flex; flex-wrap: wrap; gap: 10px; margin-top: 12px; }
.strip figure { margin: 0; text-align: center; }
.strip img { display: block; border-radius: 6px; background: #000; image-rendering: auto; }
.strip figcaption { margin-top: 3px; font-size: 12px; font-variant-numeric: tabular-nums; }
.note { color: var(--muted); font-size: 13.5px; font-style: italic; margin: 10px 0 0; }
.notice { background: #fff8e6; border: 1px solid #f0d9a6; color: #6b4a00; border-radius: 8px; padding: 10px 14px; margin: 14px 0; font-size: 14px; }
footer { color: var(--muted); font-size: 12.5px; margin-top: 48px; border-top: 1px solid var(--line); padding-top: 12px; }
@media print { html { background: #fff; } .toss, .panel, .card { break-inside: avoid; } header.masthead { background: #12324a; -webkit-print-color-adjust: exact; print-color-adjust: exact; } }
`;
