import { cssString } from './escape.js';

/**
 * The report's style sheet: screen and print, with the page size of the chosen paper, page
 * numbers and the line name in the page margins, table rows and figures never split across
 * pages, table headers repeated on every page. System fonts only: nothing is loaded.
 */
export function reportCss(paper: 'A4' | 'Letter', footer: string): string {
  return `
:root { --ink: #1b1f24; --muted: #5a6270; --rule: #b9c0c8; --faint: #eef1f4; --accent: #1f4e79; }
* { box-sizing: border-box; }
html { font-family: "Liberation Sans", "Helvetica Neue", Helvetica, Arial, sans-serif; font-size: 10pt; color: var(--ink); }
body { margin: 0 auto; max-width: 180mm; padding: 10mm 0; line-height: 1.38; }
h1 { font-size: 19pt; margin: 0 0 1mm; font-weight: 700; color: var(--accent); letter-spacing: -0.2pt; }
h2 { font-size: 12.5pt; margin: 7mm 0 2.5mm; padding-bottom: 1mm; border-bottom: 1.2pt solid var(--accent); color: var(--accent); break-after: avoid; }
h2 .no { display: inline-block; min-width: 8mm; }
h3 { font-size: 10.5pt; margin: 4mm 0 1.5mm; break-after: avoid; }
p { margin: 0 0 2mm; }
.kicker { text-transform: uppercase; letter-spacing: 1.2pt; font-size: 8pt; color: var(--muted); margin: 0 0 1mm; }
.subtitle { font-size: 12pt; margin: 0 0 4mm; color: var(--muted); }
.title-block { border-top: 3pt solid var(--accent); padding-top: 4mm; }
table { border-collapse: collapse; width: 100%; margin: 1mm 0 3mm; font-variant-numeric: tabular-nums; }
thead { display: table-header-group; }
tr, figure, .signature, .limits, li { break-inside: avoid; page-break-inside: avoid; }
th, td { text-align: left; vertical-align: top; padding: 1.1mm 1.6mm; }
table.job th { width: 48mm; font-weight: 600; color: var(--muted); }
table.job td, table.job th { border-bottom: 0.5pt solid var(--rule); padding: 0.9mm 1.6mm; }
table.data thead th { border-top: 1pt solid var(--ink); border-bottom: 0.75pt solid var(--ink); font-weight: 600; font-size: 8.5pt; vertical-align: bottom; background: var(--faint); }
table.data td { border-bottom: 0.4pt solid var(--rule); font-size: 9pt; }
table.data tbody tr:last-child td { border-bottom: 1pt solid var(--ink); }
table.kv th { font-weight: normal; width: 70%; border-bottom: 0.4pt solid var(--rule); font-size: 9pt; }
table.depths td, table.depths th { padding: 0.55mm 1.4mm; font-size: 8.3pt; }
td.n, th.n { text-align: right; white-space: nowrap; }
td.rec { font-weight: 600; }
.tight { white-space: nowrap; }
td.cls { font-weight: 700; }
table.methods td { font-size: 8.6pt; border-bottom: 0.4pt solid var(--rule); }
table.methods th { border-top: 1pt solid var(--ink); border-bottom: 0.75pt solid var(--ink); background: var(--faint); font-size: 8.5pt; }
table.methods td:first-child { width: 30%; font-weight: 600; }
table.methods td:nth-child(2) { width: 27%; }
td.hash, td.file { font-family: "Liberation Mono", "DejaVu Sans Mono", monospace; font-size: 7.4pt; word-break: break-all; }
td.params { font-family: "Liberation Mono", "DejaVu Sans Mono", monospace; font-size: 7.4pt; }
td.params span { display: inline-block; margin-right: 3mm; }
.command code { font-family: "Liberation Mono", "DejaVu Sans Mono", monospace; font-size: 8pt; word-break: break-all; }
.command { background: var(--faint); padding: 2mm 3mm; border-left: 2pt solid var(--rule); }
.note { color: var(--muted); font-size: 8.6pt; }
.notice { border-left: 2.5pt solid #b35806; background: #fdf3ea; padding: 1.6mm 3mm; font-size: 9pt; }
.missing { color: #b35806; font-style: italic; }
.estimated { border: 1pt solid #b35806; padding: 2mm 3mm; background: #fdf3ea; }
ul.summary { padding-left: 5mm; margin: 0 0 3mm; }
ul.summary li { margin-bottom: 1.2mm; }
.limits { border: 0.75pt solid var(--rule); background: var(--faint); padding: 1mm 4mm 2mm; }
.limits h3 { margin-top: 1.5mm; }
.limits ol { margin: 0; padding-left: 5mm; }
ul.qualifiers, ul.cautions, ol.warnings { padding-left: 5mm; font-size: 9pt; }
ul.qualifiers { color: var(--muted); font-size: 8.5pt; }
ol.warnings li, ul.cautions li { margin-bottom: 1.2mm; }
.code { font-family: "Liberation Mono", "DejaVu Sans Mono", monospace; font-size: 7.6pt; color: var(--muted); background: var(--faint); padding: 0 1mm; }
figure { margin: 2mm 0 4mm; }
figcaption { font-size: 8.6pt; color: var(--muted); margin-top: 1.5mm; }
.legend { display: block; margin-bottom: 1.2mm; color: var(--ink); }
.key { display: inline-block; margin-right: 4mm; white-space: nowrap; }
.swatch { width: 6mm; height: 3mm; vertical-align: middle; margin-right: 1mm; }
svg.figure-svg { width: 100%; height: auto; display: block; font-family: inherit; }
svg .grid line { stroke: #e3e7eb; stroke-width: 0.6; }
svg .plot-border { fill: none; stroke: #6b7380; stroke-width: 0.8; }
svg .tick-labels text { font-size: 9px; fill: #3a414b; }
svg .axis-title { font-size: 10px; fill: var(--ink); }
svg .segments line { stroke-width: 1.3; }
svg .outlier { stroke-width: 1.2; fill: none; }
svg .band { fill-opacity: 0.18; stroke: none; }
svg .method-line { fill: none; stroke-width: 0.9; stroke-opacity: 0.85; }
svg .recommended { fill: none; stroke-width: 2.1; }
svg .interpolated { fill: none; stroke: #fff; stroke-width: 1; stroke-dasharray: 3 3; }
svg .intercept { fill: #fff; stroke-width: 1; }
svg .ground { fill: none; stroke: #111; stroke-width: 1.5; }
svg .geophones line { stroke: #111; stroke-width: 0.8; }
svg .sources path { fill: #111; }
svg .contour { fill: none; stroke: #111; stroke-width: 1.4; }
svg .layered { fill: none; stroke: #111; stroke-width: 1; stroke-dasharray: 4 2; }
svg .layer-label { font-size: 9.5px; fill: var(--ink); paint-order: stroke; stroke: #fff; stroke-width: 3px; stroke-linejoin: round; }
.signatures { display: flex; gap: 8mm; }
.signature { flex: 1; border: 0.75pt solid var(--ink); padding: 1mm 3mm 2mm; }
.signature th { width: 40%; font-weight: normal; color: var(--muted); padding: 4.5mm 1mm 0.8mm; }
.signature td { border-bottom: 0.6pt solid var(--ink); padding: 4.5mm 1mm 0.8mm; }
@page { size: ${paper === 'Letter' ? 'letter' : 'A4'} portrait; margin: 16mm 15mm 18mm 15mm;
  @bottom-left { content: ${cssString(footer)}; font-family: "Liberation Sans", Arial, sans-serif; font-size: 7.5pt; color: #5a6270; }
  @bottom-right { content: "Page " counter(page) " of " counter(pages); font-family: "Liberation Sans", Arial, sans-serif; font-size: 7.5pt; color: #5a6270; } }
@media print {
  body { max-width: none; padding: 0; }
  h2 { break-after: avoid; }
  section#signatures { break-inside: avoid; }
  a { color: inherit; text-decoration: none; }
}
`;
}
