/** Print-friendly styles of the review report (A4, no external resources). */
export const REPORT_CSS = `
@page { size: A4; margin: 16mm 14mm; }
:root { color: #222; font-family: 'DejaVu Sans', 'Liberation Sans', Arial, sans-serif; font-size: 10.5pt; line-height: 1.45; }
body { max-width: 180mm; margin: 0 auto; padding: 8mm 0; }
h1 { font-size: 17pt; margin: 0 0 2mm; }
h2 { font-size: 13pt; margin: 8mm 0 2mm; border-bottom: 1px solid #bbb; padding-bottom: 1mm; page-break-after: avoid; }
h3 { font-size: 11pt; margin: 4mm 0 1mm; }
table { border-collapse: collapse; margin: 2mm 0; font-size: 9.5pt; }
th, td { border: 1px solid #ccc; padding: 1mm 2mm; text-align: left; vertical-align: top; }
th { background: #f2f2f2; }
thead { display: table-header-group; }
tr { page-break-inside: avoid; }
.caution { border: 2px solid #D55E00; background: #fff6ef; padding: 2mm 4mm; margin: 3mm 0; }
.caution strong { color: #a13f00; }
.figure { page-break-inside: avoid; margin: 3mm 0; }
.figure svg { max-width: 100%; height: auto; display: block; }
.figure p { font-size: 9pt; margin: 1mm 0 0; color: #444; }
.verdict-holds { font-weight: bold; color: #006b4f; }
.verdict-fails { font-weight: bold; color: #a13f00; }
.flag { font-weight: bold; color: #a13f00; }
.muted { color: #555; }
code { font-family: 'DejaVu Sans Mono', monospace; font-size: 9pt; }
code.hash { font-size: 7.5pt; word-break: break-all; }
.claims { width: 100%; table-layout: fixed; font-size: 8pt; }
.claims th, .claims td { padding: 0.8mm 1.2mm; overflow-wrap: anywhere; }
.claims th { overflow-wrap: normal; }
.sign-off { page-break-inside: avoid; margin-top: 8mm; }
.sign-off table { width: 100%; }
.sign-off td { height: 10mm; }
.sign-line { display: inline-block; min-width: 55mm; }
.sign-box { height: 22mm; }
@media print { body { padding: 0; } a { color: inherit; text-decoration: none; } }
`;
