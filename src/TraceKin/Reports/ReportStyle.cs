namespace TraceKin.Reports;

/// <summary>
/// The report's stylesheet: plain and readable on screen, and a print layout with page margins that suit both A4 and
/// US Letter, table rows and figures kept whole across page breaks, and plots scaled to the page width.
/// </summary>
internal static class ReportStyle
{
    public const string Css = """
:root { --ink: #1f2328; --muted: #5b6470; --rule: #d8dce1; --soft: #f5f6f8; --bad: #9b1c1c; --bad-bg: #fdf0f0; --warn: #7a4b00; --warn-bg: #fff6e0; --ok: #1c6b3a; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); background: #fff; font: 15px/1.45 "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; }
main { max-width: 1100px; margin: 0 auto; padding: 24px 28px 48px; }
header { border-bottom: 2px solid var(--ink); margin-bottom: 18px; padding-bottom: 8px; }
.kicker { margin: 0; color: var(--muted); font-size: 13px; letter-spacing: .04em; text-transform: uppercase; }
h1 { margin: 4px 0 6px; font-size: 26px; font-weight: 600; }
h2 { margin: 28px 0 10px; font-size: 19px; font-weight: 600; border-bottom: 1px solid var(--rule); padding-bottom: 4px; }
h3 { margin: 18px 0 6px; font-size: 16px; font-weight: 600; }
.description { margin: 0 0 4px; font-size: 16px; }
.counts, .note { color: var(--muted); font-size: 13px; }
.none { color: var(--muted); font-style: italic; }
table { border-collapse: collapse; margin: 6px 0 12px; font-size: 13px; }
th, td { border: 1px solid var(--rule); padding: 4px 8px; text-align: left; vertical-align: top; }
thead th { background: var(--soft); font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.hash { font-family: "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 11px; word-break: break-all; }
tr.flagged td { background: var(--warn-bg); }
table.hist td.bar { width: 60%; }
table.hist td.bar span { display: block; height: 10px; background: var(--muted); }
tr.not-used td { color: var(--muted); }
td.warn-cell { color: var(--warn); }
tr.source-default td { color: var(--muted); }
table.defaults { font-size: 11.5px; }
table.defaults td, table.defaults th { padding: 2px 6px; }
.box { border: 2px solid; border-radius: 4px; padding: 4px 14px 8px; margin: 10px 0; }
.box ul { margin: 4px 0; padding-left: 20px; }
.box li { margin: 4px 0; }
.rejected { border-color: var(--bad); background: var(--bad-bg); }
.rejected h3 { color: var(--bad); }
.warnings { border-color: #d99a1e; background: var(--warn-bg); }
.warnings h3 { color: var(--warn); }
p.headline { font-size: 17px; font-weight: 600; margin: 6px 0; }
.notes { border-width: 1px; border-color: var(--rule); }
details.fits > summary { cursor: pointer; color: var(--muted); }
.notes summary { cursor: pointer; color: var(--muted); padding: 2px 0; }
.where { font-weight: 600; }
.hint { color: var(--muted); }
.code { color: var(--muted); font-size: 12px; font-family: "DejaVu Sans Mono", Menlo, Consolas, monospace; }
#attention.all-clear p { color: var(--ok); }
pre.fit-report { background: var(--soft); border: 1px solid var(--rule); padding: 8px 10px; font-size: 12px; overflow-x: auto; }
figure.plot { margin: 12px 0 20px; }
figure.plot img { display: block; max-width: 100%; height: auto; border: 1px solid var(--rule); }
figcaption { color: var(--muted); font-size: 13px; margin-top: 4px; }
dl dt { font-weight: 600; margin-top: 8px; }
dl dd { margin: 2px 0 0 0; }
#cautions dl { border-left: 4px solid #d99a1e; padding-left: 12px; }
@page { margin: 18mm 16mm 18mm 16mm; }
@media print {
  body { font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  table { font-size: 8.5pt; }
  thead { display: table-header-group; }
  tr, figure, .box, pre, dl dd { break-inside: avoid; page-break-inside: avoid; }
  figure.plot img { max-width: 100%; max-height: 200mm; width: auto; }
  .box, tr.flagged td, thead th { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  a { color: inherit; text-decoration: none; }
}
""";
}
