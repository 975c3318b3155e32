/** The report's inline stylesheet: system fonts only, prints on A4/Letter, no network. */
export const REPORT_CSS = `
:root { --ink: #1d2433; --muted: #5b6475; --line: #dfe3ea; --panel: #f6f7f9; --ok: #1b7f4b; --bad: #b3261e; --warn-bg: #fff4e0; --warn: #8a4b00; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); background: #fff; font: 14px/1.5 system-ui, -apple-system, 'Segoe UI', Roboto, 'DejaVu Sans', sans-serif; }
main { max-width: 1420px; margin: 0 auto; padding: 24px 28px 48px; }
header.top { border-bottom: 3px solid var(--ink); padding-bottom: 10px; margin-bottom: 16px; }
h1 { font-size: 24px; margin: 0 0 4px; letter-spacing: 0.01em; }
h2 { font-size: 19px; margin: 34px 0 8px; padding-top: 10px; border-top: 1px solid var(--line); }
h3 { font-size: 15px; margin: 18px 0 6px; color: var(--muted); font-weight: 600; text-transform: uppercase; letter-spacing: 0.04em; }
.meta { color: var(--muted); margin: 0; }
.caution { background: var(--warn-bg); border: 2px solid #e0a040; border-left-width: 10px; padding: 12px 16px; margin: 16px 0; font-size: 15px; color: var(--warn); }
.caution strong { display: block; font-size: 16px; letter-spacing: 0.05em; margin-bottom: 2px; }
.notes { margin: 0 0 12px; padding-left: 18px; color: var(--muted); }
table { border-collapse: collapse; margin: 4px 0 10px; font-variant-numeric: tabular-nums; }
th, td { padding: 4px 10px; border-bottom: 1px solid var(--line); text-align: left; white-space: nowrap; }
th { background: var(--panel); font-weight: 600; font-size: 13px; }
td.num, th.num { text-align: right; }
tr.chosen td { font-weight: 700; background: #eef7f1; }
tr.chosen td:first-child { box-shadow: inset 4px 0 0 var(--ok); }
.far { color: var(--bad); font-weight: 600; }
.badge { display: inline-block; padding: 1px 9px; border-radius: 10px; font-size: 12px; font-weight: 700; letter-spacing: 0.05em; vertical-align: middle; margin-left: 8px; color: #fff; }
.badge.ok { background: var(--ok); }
.badge.bad { background: var(--bad); }
.verdict { margin: 4px 0 10px; }
.verdict.bad { color: var(--bad); font-weight: 600; }
.tables { display: flex; flex-wrap: wrap; gap: 8px 36px; align-items: flex-start; }
.tables > div { min-width: 0; }
.charts { display: grid; grid-template-columns: repeat(auto-fill, minmax(460px, 1fr)); gap: 18px; margin: 10px 0; }
figure { margin: 0; border: 1px solid var(--line); border-radius: 6px; padding: 8px; background: #fff; }
figure svg { display: block; width: 100%; height: auto; }
pre.source { background: var(--panel); border: 1px solid var(--line); padding: 10px 12px; overflow-x: auto; font: 12.5px/1.45 ui-monospace, 'DejaVu Sans Mono', Menlo, Consolas, monospace; }
details summary { cursor: pointer; color: var(--muted); }
footer { margin-top: 40px; padding-top: 10px; border-top: 1px solid var(--line); color: var(--muted); font-size: 12.5px; }
@media print { .charts { grid-template-columns: 1fr 1fr; } figure { break-inside: avoid; } h2 { break-before: page; } }
`;
