// The hand-over report's style sheet: A4 pages, print rules, tables and figures.
import { NOTES_CSS } from './notes.ts';

export const REPORT_CSS = `
@page { size: A4; margin: 14mm 13mm 16mm 13mm; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { margin: 0; font: 9.5pt/1.4 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", Helvetica, Arial, sans-serif; color: #1b1f1e; background: #fff; }
main { max-width: 184mm; margin: 0 auto; padding: 8mm 0; }
@media print { main { padding: 0; max-width: none; } }
.n { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 0.92em; }
.r { text-align: right; }
h1 { font-size: 17pt; margin: 2px 0 4px; }
h2 { font-size: 12pt; margin: 14px 0 6px; padding-bottom: 2px; border-bottom: 1px solid #c9cfcc; break-after: avoid; }
h3 { font-size: 10pt; margin: 10px 0 4px; break-after: avoid; }
.brand { font-size: 8.5pt; letter-spacing: 0.06em; text-transform: uppercase; color: #0b6e69; font-weight: 600; }
.meta { color: #4a5552; margin: 0 0 6px; font-size: 8.5pt; }
table { border-collapse: collapse; width: 100%; margin: 4px 0; }
th, td { text-align: left; vertical-align: top; padding: 2px 5px; }
table.kv th { width: 30%; font-weight: 600; color: #333; }
table.kv tr { border-bottom: 1px solid #eef0ef; }
table.grid { font-size: 8.5pt; }
table.grid thead th { background: #eef1f0; border-bottom: 1px solid #b9c0bd; font-weight: 600; }
table.grid td { border-bottom: 1px solid #eef0ef; }
tr { break-inside: avoid; }
.notes { white-space: pre-wrap; }
.small { font-size: 7.8pt; color: #4a5552; }
.muted { color: #6b7370; font-style: italic; }
.two { display: flex; gap: 6mm; }
.two > div { flex: 1; min-width: 0; }
figure { margin: 4px 0; break-inside: avoid; }
figcaption { font-size: 7.8pt; color: #4a5552; }
.thumbs { display: grid; grid-template-columns: 1fr 1fr; gap: 2mm 5mm; }
${NOTES_CSS}
.shapes { display: grid; grid-template-columns: 1fr 1fr 1fr; gap: 2mm 4mm; }
.thumb, .shape { border: 1px solid #e4e7e5; padding: 1mm; }
.keep { break-inside: avoid; }
table.macm { width: auto; }
table.macm td.mac { text-align: center; min-width: 11mm; }
.trace td.hash, .trace td.ids, span.hash { word-break: break-all; font-size: 7pt; }
.trace td.ids { font-size: 6.5pt; }
.trace-item { font-size: 7.6pt; line-height: 1.45; padding: 1.2mm 0; border-bottom: 1px solid #eef0ef; break-inside: avoid; }
.trace-item .n { font-size: 7pt; }
.hash-list { font-size: 7pt; columns: 1; }
.hash-list div { break-inside: avoid; }
.trace-item .id { white-space: nowrap; display: inline-block; margin-right: 1.5mm; }
.caution { border: 1.5px solid #8a3b0b; padding: 2mm 4mm; margin-top: 8px; }
.caution h2 { border: none; margin-top: 4px; }
.appendix { break-before: page; }
.shared { background: #fff6e0; border: 1px solid #d9b25a; padding: 2mm 4mm; font-size: 8.5pt; }
ul.conv li { margin-bottom: 2px; }
footer { margin-top: 10mm; border-top: 1px solid #c9cfcc; padding-top: 2mm; }
`;
