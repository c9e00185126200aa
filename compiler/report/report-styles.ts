// The report's only style sheet, inlined into the page: system fonts (no downloads), dark text
// on white with at least 4.5:1 contrast for body text (WCAG 2.1 SC 1.4.3), and charts that
// shrink with the window. Text inside charts gets its colour from CSS classes; cell numbers
// in the heat map carry their own fill, so no rule here sets the fill of all text (CSS would
// override those SVG presentation attributes); unstyled SVG text is black.

/** The CSS of the report page. */
export const REPORT_STYLES = `
:root { color-scheme: light; --ink: #1a1a1a; --muted: #4a4a4a; --rule: #cfcfcf; --panel: #f5f5f2; --accent: #0a5c96; }
* { box-sizing: border-box; }
html { background: #ffffff; }
body { margin: 0; color: var(--ink); background: #ffffff; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans", "DejaVu Sans", Arial, sans-serif; }
main { max-width: 1100px; margin: 0 auto; padding: 28px 28px 64px; }
h1 { font-size: 1.9rem; line-height: 1.2; margin: 0 0 .3rem; }
h2 { font-size: 1.4rem; margin: 2.6rem 0 .6rem; padding-top: .6rem; border-top: 2px solid var(--ink); }
h3 { font-size: 1.08rem; margin: 1.2rem 0 .35rem; }
p, li { max-width: 78ch; }
.lede { color: var(--muted); margin: 0 0 1rem; }
nav ul { display: flex; flex-wrap: wrap; gap: .25rem 1.25rem; list-style: none; padding: 0; margin: .5rem 0 1rem; }
a { color: var(--accent); }
:focus-visible { outline: 3px solid #0072B2; outline-offset: 2px; }
.summary { display: grid; grid-template-columns: repeat(auto-fit, minmax(150px, 1fr)); gap: 12px; margin: 1rem 0; }
.summary div { background: var(--panel); border: 1px solid var(--rule); border-radius: 6px; padding: 10px 14px; }
.summary dt { font-size: .85rem; color: var(--muted); }
.summary dd { margin: 0; font-size: 1.5rem; font-weight: 650; font-variant-numeric: tabular-nums; }
.caveats { border-left: 6px solid #D55E00; background: #fdf0e6; padding: .4rem 1.1rem .6rem; margin: 1rem 0; }
.caveats h2 { border-top: none; margin: .4rem 0 .2rem; padding-top: 0; font-size: 1.15rem; }
.note { color: var(--muted); font-style: italic; }
figure { margin: 0; }
.chart-figure { margin: 1rem 0 1.5rem; }
.side-by-side { display: flex; flex-wrap: wrap; gap: 8px 28px; align-items: flex-start; }
.side-by-side > svg { flex: 0 1 auto; }
.chart-notes { flex: 1 1 260px; min-width: 0; }
.chart-notes figcaption { margin-top: 0; }
figcaption { color: var(--muted); font-size: .92rem; margin-top: .4rem; max-width: 78ch; }
svg.chart { display: block; max-width: 100%; height: auto; }
svg.chart text { font-family: inherit; }
svg.chart .tick { font-size: 11px; fill: #333333; }
svg.chart .axis-title, svg.chart .panel-title { font-size: 12.5px; font-weight: 650; }
svg.chart .label { font-size: 12px; }
svg.chart .sublabel { font-size: 11px; fill: var(--muted); }
svg.chart .cell { font-weight: 650; }
svg.chart .cell-large { font-size: 15px; }
svg.chart .cell-medium { font-size: 13px; }
svg.chart .cell-small { font-size: 9.5px; }
svg.chart .cell-diagonal { font-weight: 800; }
svg.chart .cell-share { font-size: 12px; }
svg.chart .annotation, svg.chart .legend-title { font-size: 11.5px; }
svg.chart .legend-title { font-weight: 650; }
svg.chart .bar-count, svg.chart .dot-value, svg.chart .bar-value { font-size: 11px; font-variant-numeric: tabular-nums; }
svg.chart .headline-number { font-size: 14px; font-weight: 650; }
svg.chart .note-text { font-size: 12px; font-style: italic; fill: var(--muted); }
.panel-grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(322px, 1fr)); gap: 16px 18px; }
.panel { border: 1px solid var(--rule); border-radius: 6px; padding: 4px 8px 8px; }
.panel h3 { margin: .4rem 0 .2rem; overflow-wrap: anywhere; }
.points { margin: .2rem 0; padding-left: 1.1rem; font-size: .86rem; }
.table-scroll { overflow-x: auto; }
table { border-collapse: collapse; font-size: .9rem; margin: .5rem 0; font-variant-numeric: tabular-nums; }
caption { text-align: left; font-weight: 650; padding: .25rem 0; }
th, td { border-bottom: 1px solid var(--rule); padding: 4px 10px; text-align: left; vertical-align: top; }
thead th { border-bottom: 2px solid var(--ink); }
.number { text-align: right; white-space: nowrap; }
table.mistakes td:last-child { min-width: 30ch; max-width: 60ch; }
details.data-table { margin: .4rem 0; }
details.data-table > summary { cursor: pointer; color: var(--accent); font-size: .92rem; }
.two-columns { display: grid; grid-template-columns: repeat(auto-fit, minmax(320px, 1fr)); gap: 0 32px; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 14px; margin: .3rem 0; }
dl.facts dt { font-weight: 650; }
dl.facts dd { margin: 0; overflow-wrap: anywhere; }
.use-note { background: var(--panel); border: 1px solid var(--rule); border-radius: 6px; padding: .2rem 1.2rem .6rem; }
footer { margin-top: 3rem; color: var(--muted); font-size: .9rem; }
@media print { h2 { break-after: avoid; } figure, .panel { break-inside: avoid; } }
`;
