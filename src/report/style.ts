/**
 * The report's style sheet, inlined into every report (no external fonts or files).
 * Colours: text near-black on white, the invented-data banner in the palette's orange
 * with dark text (contrast above 7:1), links in the palette's blue.
 */
export const REPORT_STYLE = `
:root { color-scheme: light; }
body { font-family: "DejaVu Sans", Verdana, Helvetica, Arial, sans-serif; color: #1a1a1a; background: #fff;
  max-width: 980px; margin: 0 auto; padding: 24px 20px 48px; line-height: 1.5; font-size: 15px; }
h1 { font-size: 26px; margin: 0 0 4px; }
h2 { font-size: 20px; margin: 32px 0 8px; padding-bottom: 4px; border-bottom: 2px solid #0072B2; }
h3 { font-size: 16px; margin: 20px 0 6px; }
.subtitle { margin: 0 0 12px; color: #404040; }
.invented { background: #fdf0cf; border-left: 6px solid #E69F00; padding: 10px 14px; margin: 12px 0; }
nav h2 { font-size: 15px; border: none; margin: 16px 0 0; }
nav ol { margin: 4px 0; padding-left: 22px; }
a { color: #0060a0; }
figure.plot { margin: 16px 0; overflow-x: auto; }
figure.plot svg { max-width: 100%; height: auto; display: block; }
figcaption { font-size: 13px; color: #404040; margin-top: 4px; }
div.table { overflow-x: auto; margin: 12px 0; }
table { border-collapse: collapse; font-size: 14px; }
caption { text-align: left; font-weight: bold; padding-bottom: 4px; }
th, td { padding: 3px 10px; border-bottom: 1px solid #d9d9d9; text-align: left; vertical-align: top; }
th { border-bottom: 2px solid #4d4d4d; }
.num { text-align: right; font-variant-numeric: tabular-nums; }
dl.facts { display: grid; grid-template-columns: max-content auto; gap: 2px 16px; margin: 8px 0; }
dl.facts dt { font-weight: bold; }
dl.facts dd { margin: 0; overflow-wrap: anywhere; }
ol.provenance li { margin: 4px 0; }
ol.provenance .step { font-weight: bold; }
ol.provenance .version { color: #404040; }
ol.provenance code { display: block; font-size: 13px; overflow-wrap: anywhere; }
pre { background: #f4f4f4; padding: 8px 12px; overflow-x: auto; }
code { font-family: "DejaVu Sans Mono", Menlo, Consolas, monospace; }
.safety { font-size: 14px; }
footer { margin-top: 40px; font-size: 13px; color: #404040; }
@media print { body { max-width: none; } nav { display: none; } }
`.trim();
