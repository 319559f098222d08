/** The explorer page's style sheet: readable at 1280×800 and on a projector, printable colours. */
export const EXPLORER_CSS = `
:root { color: #1d1d1d; font-family: 'DejaVu Sans', 'Liberation Sans', Arial, sans-serif; font-size: 15px; line-height: 1.4; }
* { box-sizing: border-box; }
body { margin: 0; background: #fafafa; }
header { display: flex; align-items: baseline; gap: 16px; padding: 8px 16px; background: #1f3b57; color: #fff; }
header h1 { font-size: 19px; margin: 0; }
header p { margin: 0; font-size: 14px; opacity: 0.9; }
.layout { display: grid; grid-template-columns: 330px minmax(0, 1fr); gap: 12px; padding: 10px 14px 70px; }
aside { position: sticky; top: 8px; align-self: start; max-height: calc(100vh - 80px); overflow-y: auto; background: #fff; border: 1px solid #d4d4d4; padding: 8px 12px; }
aside h2, main h2 { font-size: 16px; margin: 10px 0 6px; }
aside h2:first-child { margin-top: 2px; }
label { display: block; margin: 5px 0; }
label.inline { display: inline-block; margin-right: 10px; }
input[type="number"], select { font: inherit; padding: 2px 4px; max-width: 100%; }
input[type="number"] { width: 6.5em; }
input[type="range"] { width: 100%; }
button { font: inherit; padding: 4px 10px; margin: 3px 4px 3px 0; border: 1px solid #1f3b57; background: #eef3f8; border-radius: 3px; cursor: pointer; }
button:focus-visible, select:focus-visible, input:focus-visible, [data-device]:focus-visible { outline: 3px solid #e69f00; outline-offset: 2px; }
[data-device] { cursor: pointer; }
[data-device]:hover rect:not(.hit), [data-device]:hover path { stroke-width: 2.2; }
.error { color: #a13f00; font-weight: bold; min-height: 1.2em; margin: 4px 0; overflow-wrap: anywhere; }
.muted { color: #555; }
.flag { color: #a13f00; font-weight: bold; }
.faults { padding-left: 18px; margin: 4px 0; }
.faults li { margin: 3px 0; }
.faults .open, .faults .short { color: #a13f00; }
.toggle { display: block; font-size: 13px; margin: 2px 0 0; }
code { font-family: 'DejaVu Sans Mono', monospace; font-size: 13px; }
#command-line { display: block; background: #f2f2f2; border: 1px solid #ccc; padding: 4px 6px; font-size: 12px; overflow-wrap: anywhere; margin: 4px 0; }
main section { background: #fff; border: 1px solid #d4d4d4; padding: 8px 12px; margin-bottom: 12px; }
.result-head { display: flex; align-items: baseline; gap: 14px; flex-wrap: wrap; }
.result-head output { font-size: 30px; font-weight: bold; font-variant-numeric: tabular-nums; }
body[data-pending="result"] .result-head::after { content: 'computing…'; color: #555; font-size: 14px; animation: appear 0s 0.25s both; }
@keyframes appear { from { visibility: hidden; } to { visibility: visible; } }
.verdict { font-weight: bold; margin: 4px 0; }
.verdict.good { color: #006b4f; }
.verdict.warn { color: #7a5200; }
.verdict.bad { color: #a13f00; }
table { border-collapse: collapse; margin: 4px 0; font-size: 14px; }
th, td { border: 1px solid #ccc; padding: 3px 6px; text-align: left; vertical-align: top; }
th { background: #f2f2f2; font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
td.big { font-weight: bold; }
.unit { font-weight: normal; color: #444; }
.restrictions { margin: 4px 0; padding-left: 18px; font-size: 14px; }
.leg-row { margin: 8px 14px 0; background: #fff; border: 1px solid #d4d4d4; padding: 4px 10px 2px; }
.leg-row h2 { font-size: 15px; margin: 2px 0; font-weight: 600; }
.leg-row h2 .muted { font-weight: normal; font-size: 13px; }
.legs { display: grid; grid-template-columns: repeat(3, minmax(0, 1fr)); gap: 8px; }
.legs figure { margin: 0; }
.legs figcaption { font-weight: bold; }
.legs svg, .plots svg { width: 100%; height: auto; display: block; }
.plots { display: grid; grid-template-columns: repeat(2, minmax(0, 1fr)); gap: 10px; }
.plots figure { margin: 0; }
.cautions { position: fixed; left: 0; right: 0; bottom: 0; background: #fff6ef; border-top: 2px solid #D55E00; padding: 4px 14px; font-size: 12.5px; line-height: 1.35; }
.cautions strong { color: #a13f00; }
@media (max-width: 1100px) { .layout { grid-template-columns: 1fr; } aside { position: static; max-height: none; } .plots { grid-template-columns: 1fr; } }
`;
