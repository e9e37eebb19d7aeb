/**
 * The report's stylesheet, inline (one self-contained file): system fonts only, no web fonts; screen layout
 * for a wide window, and a print stylesheet whose page box fits both A4 (210 × 297 mm) and US Letter
 * (8.5 × 11 in): 14 mm margins leave at most 182 mm of width on either, and figures and table rows are
 * kept whole across page breaks.
 */
export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { margin: 0; font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: #222; background: #fff; }
main, header.report, footer.report, nav.contents { max-width: 1240px; margin: 0 auto; padding: 0 20px; }
h1 { font-size: 1.6rem; margin: 1.2rem 0 0.4rem; }
h2 { font-size: 1.25rem; margin: 2rem 0 0.6rem; padding-top: 0.4rem; border-top: 2px solid #0072B2; }
h3 { font-size: 1.05rem; margin: 1.2rem 0 0.4rem; }
p, li { max-width: 80em; }
.status { display: inline-block; padding: 0.1rem 0.6rem; border-radius: 0.3rem; font-weight: 600; border: 2px solid; }
.status.passed { border-color: #009E73; color: #00593f; }
.status.failed { border-color: #D55E00; color: #8a3c00; }
.cautions { border: 2px solid #D55E00; border-left-width: 8px; padding: 0.5rem 1rem; margin: 0.8rem 0; background: #fff8f2; }
.cautions h2, .key-fact h2 { border: 0; margin: 0.2rem 0; padding: 0; font-size: 1.05rem; }
.key-fact { border: 2px solid #0072B2; border-left-width: 8px; padding: 0.5rem 1rem; margin: 0.8rem 0; background: #f2f8fc; }
.key-fact.fails { border-color: #D55E00; background: #fff8f2; }
.key-fact p { margin: 0.3rem 0; }
.notice { border-left: 6px solid #E69F00; padding: 0.3rem 0.8rem; background: #fffaf0; }
nav.contents ol { columns: 2; padding-left: 1.4rem; }
table { border-collapse: collapse; margin: 0.6rem 0 1rem; font-size: 0.9rem; }
caption { text-align: left; font-weight: 600; padding-bottom: 0.3rem; }
th, td { border-bottom: 1px solid #ccc; padding: 0.2rem 0.6rem; text-align: left; vertical-align: top; }
td.number { text-align: right; font-variant-numeric: tabular-nums; }
thead th { border-bottom: 2px solid #444; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.25rem 1rem; }
dt { font-weight: 600; }
dd { margin: 0; }
.panels { display: grid; grid-template-columns: 1fr; gap: 0.4rem; }
figure.row { grid-column: 1 / -1; }
figure.row .panels { grid-template-columns: repeat(auto-fill, minmax(360px, 1fr)); }
.grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(520px, 1fr)); gap: 1.2rem 1.6rem; }
figure { margin: 0; break-inside: avoid; page-break-inside: avoid; }
figcaption { font-weight: 600; margin-bottom: 0.2rem; }
figure .note { font-size: 0.85rem; color: #444; margin: 0.2rem 0; }
svg.plot { display: block; width: 100%; height: auto; overflow: visible; }
svg.plot text { font-family: system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; fill: #222; }
ul.legend { list-style: none; padding: 0; margin: 0.2rem 0; display: flex; flex-wrap: wrap; gap: 0.2rem 1rem; font-size: 0.85rem; }
ul.legend li { display: flex; align-items: center; gap: 0.35rem; }
ul.legend svg { width: 28px; height: 12px; flex: none; }
details { font-size: 0.85rem; margin: 0.3rem 0 0.6rem; }
details summary { cursor: pointer; color: #0072B2; }
.table-scroll { overflow-x: auto; }
pre { white-space: pre-wrap; word-break: break-word; font-size: 0.8rem; background: #f6f6f6; padding: 0.5rem; }
code, .mono { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 0.85em; word-break: break-all; }
footer.report { margin: 2rem auto 2rem; font-size: 0.85rem; color: #444; border-top: 1px solid #ccc; padding-top: 0.6rem; }
@media print {
  @page { margin: 14mm; }
  body { font-size: 10pt; }
  main, header.report, footer.report, nav.contents { max-width: none; padding: 0; }
  nav.contents, details { display: none; }
  .grid { display: block; }
  .grid > figure { width: 100%; max-width: 150mm; margin: 0 auto 5mm; }
  .grid > figure.row { max-width: none; }
  figure.row .panels { grid-template-columns: repeat(2, 1fr); }
  h2 { break-after: avoid; page-break-after: avoid; }
  h3 { break-after: avoid; page-break-after: avoid; }
  tr, .cautions, .key-fact { break-inside: avoid; page-break-inside: avoid; }
  .cautions, .key-fact, .notice { background: none; }
  a { color: inherit; text-decoration: none; }
  table { font-size: 7.5pt; }
  th, td { padding: 0.1rem 0.25rem; }
  .table-scroll { overflow: visible; }
}
`;
