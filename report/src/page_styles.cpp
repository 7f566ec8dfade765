// ridgecal report (internal): the style sheet of the report page (screen and
// print: A4/Letter page boxes, page-break rules, the verdict box styles).
#include "report_data.hpp"

namespace ridgecal::report::detail {

namespace {
const char* const kCss = R"CSS(
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; font-size: 10pt;
  line-height: 1.35; color: #111; background: #fff; max-width: 188mm; margin: 8mm auto; padding: 0 5mm; }
h1 { font-size: 16pt; margin: 0 0 1.5mm; }
h2 { font-size: 12pt; margin: 4mm 0 1.5mm; padding-bottom: 0.6mm; border-bottom: 1.5px solid #444;
  break-after: avoid; page-break-after: avoid; }
h3 { font-size: 10.5pt; margin: 3mm 0 1mm; break-after: avoid; page-break-after: avoid; }
p { margin: 1mm 0 2mm; }
figure, table, .verdict, .signoff, .keep { break-inside: avoid; page-break-inside: avoid; }
figure { margin: 0 0 3mm; }
figcaption { font-size: 9pt; color: #333; margin-top: 0.5mm; }
figcaption b { color: #111; }
table { border-collapse: collapse; font-size: 9pt; margin: 1mm 0 2mm; }
th, td { border: 1px solid #9a9a9a; padding: 0.8mm 1.8mm; text-align: left; vertical-align: top; }
th { background: #eeeeee; font-weight: bold; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.mono { font-family: "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 8.5pt; word-break: break-all; }
.meta { display: grid; grid-template-columns: max-content 1fr; column-gap: 4mm; row-gap: 0.4mm;
  font-size: 9.5pt; margin: 0; }
.meta.two { grid-template-columns: max-content 1fr max-content 1fr; }
.meta .wide { grid-column: 2 / -1; }
.meta .wide-key { grid-column: 1; }
.meta dt { font-weight: bold; color: #333; }
.meta dd { margin: 0; min-width: 0; overflow-wrap: anywhere; }
.verdict { display: flex; align-items: center; gap: 6mm; padding: 1.5mm 4mm; margin: 2mm 0 1mm;
  border: 2px dashed #666; }
.verdict .word { font-size: 22pt; font-weight: bold; letter-spacing: 0.06em; min-width: 30mm; }
.verdict .why { font-size: 9.5pt; }
.verdict .why div { margin: 0.3mm 0; }
.verdict .why div.set { font-size: 8.5pt; margin: 0 0 0 3mm; }
.verdict.pass { border: 3px solid #1b5e20; }
.verdict.pass .word { color: #1b5e20; }
.verdict.fail { border: 5px double #a0001c; }
.verdict.fail .word { color: #a0001c; }
.verdict.modified { border: 5px double #6a3d00; background: #fff4e0; }
.verdict.modified .word { color: #6a3d00; font-size: 16pt; }
table.points { font-size: 8pt; }
table.points td, table.points th { padding: 0.3mm 1.2mm; }
table.points td.conf { white-space: nowrap; }
tr.conf-fail td { color: #a0001c; font-weight: bold; }
tr.conf-not-shown td { color: #6a3d00; font-style: italic; }
td.low-tur { font-weight: bold; }
.untrusted { border-left: 3px solid #a0001c; padding-left: 2mm; }
.verdict.none .word { color: #444; font-size: 14pt; }
svg.plot { display: block; max-width: 100%; height: auto; }
figure > svg.plot, figure > .panels { max-width: 170mm; }
.panels { display: flex; gap: 1mm; }
.panels > svg { flex: 1 1 0; min-width: 0; }
.side { display: flex; gap: 4mm; align-items: flex-start; flex-wrap: wrap; }
.side > table { font-size: 8.5pt; margin-bottom: 0; }
.cols { display: grid; grid-template-columns: 1fr 1fr; column-gap: 4mm; align-items: start; }
.cols > table { width: 100%; margin-top: 0; font-size: 8.5pt; }
.note { color: #444; font-size: 9pt; }
.missing { color: #555; font-style: italic; }
.alert { color: #a0001c; }
ul.cautions { margin: 1mm 0 2mm 5mm; padding: 0; }
ul.cautions li { margin: 0.6mm 0; }
.signoff table { width: 100%; }
.signoff td { height: 13mm; }
.signoff th { width: 28mm; }
footer { margin-top: 4mm; font-size: 8pt; color: #555; border-top: 1px solid #bbb; padding-top: 1mm; }
@page { margin: 11mm 12mm 13mm 12mm;
  @bottom-left { content: "ridgecal QA calibration report"; font: 8pt "DejaVu Sans", sans-serif; color: #555; }
  @bottom-right { content: "page " counter(page) " of " counter(pages); font: 8pt "DejaVu Sans", sans-serif; color: #555; } }
@media print {
  body { max-width: none; margin: 0; padding: 0; }
  figure > svg.plot, figure > .panels { max-width: 150mm; }
}
)CSS";
}  // namespace

const char* page_css() {
  return kCss;
}

}  // namespace ridgecal::report::detail
