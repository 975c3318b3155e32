import type { StackSpec, StageSpec } from '../design/types.js';
import type { StackResult } from '../solve/types.js';
import { designCharts } from './design-charts.js';
import { eng, formatArea, formatHeadroom, formatMicrons, formatPercent, polarityName } from './format.js';
import { REPORT_CSS } from './html-style.js';
import { biasGrid, columnAlign, cornerGrid, deviceGrid, predictedGrid, squareLawGrid, statusLine, type Grid } from './rows.js';
import { stackCharts } from './stack-charts.js';
import { chosenFirst, farAreaNote, farAreaRatio } from './order.js';
import { escapeXml as esc, resultSlug } from './svg.js';
import type { HtmlReportInput } from './types.js';
import { stageSection, stageSpecGrid, stageSummaryGrid } from './stage-html.js';
import { confirmGrid, confirmVerdict, correctedGrid } from './confirm-rows.js';
import { confirmRoutChart } from './confirm-charts.js';
import { stageConfirmGrid, stageCorrectedGrid } from './confirm-stage.js';
import { stageConfirmChart, stageResponseChart } from './confirm-charts.js';
import type { StageResult } from '../solve/stage-types.js';

export function htmlTable(grid: Grid, caption?: string): string {
  const align = columnAlign(grid);
  const cls = (c: number): string => (align[c] === 'right' ? ' class="num"' : '');
  const head = grid.headers.map((h, c) => `<th${cls(c)}>${esc(h)}</th>`).join('');
  const body = grid.rows
    .map((r, k) => `<tr${grid.highlight?.[k] ? ' class="chosen"' : ''}>${r.map((cell, c) => `<td${cls(c)}>${esc(cell)}</td>`).join('')}</tr>`)
    .join('\n');
  return `<div>${caption ? `<h3>${esc(caption)}</h3>` : ''}<table><thead><tr>${head}</tr></thead><tbody>\n${body}\n</tbody></table></div>`;
}

function figure(svg: string | undefined): string {
  return svg ? `<figure>${svg}</figure>` : '';
}

function specGrid(stacks: StackSpec[]): Grid {
  return {
    headers: ['stack', 'device', 'topology', 'Iout', 'Rout ≥', 'headroom ≤', 'span', 'L range', 'gm/ID range', 'objective', 'σ(Iout)/Iout ≤', 'bias current'],
    rows: stacks.map((s) => [
      s.name, polarityName(s.device), s.topology, eng(s.current, 'A'), eng(s.rout, 'Ω'), eng(s.headroom, 'V'), eng(s.span, 'V'),
      s.l ? `${formatMicrons(s.l.min)} – ${formatMicrons(s.l.max)}${s.l.step ? ` step ${formatMicrons(s.l.step)}` : ''}` : 'table lengths',
      s.gmid ? `${eng(s.gmid.min, '/V')} – ${eng(s.gmid.max, '/V')}` : 'any',
      s.objective, s.mismatch === undefined ? '—' : formatPercent(s.mismatch), eng(s.biasCurrent ?? s.current, 'A'),
    ]),
  };
}

function summaryGrid(stacks: StackResult[], specs: Map<string, StackSpec>): Grid {
  // Per stack the chosen design first and highlighted; alternatives far larger in area are marked.
  const ordered = chosenFirst(stacks);
  return {
    headers: ['stack', 'topology', 'result', 'Iout', 'Rout (target)', 'headroom (target)', 'area', 'note'],
    rows: ordered.map((s) => {
      const t = specs.get(s.name);
      const tag = s.chosen === true ? ' (chosen)' : s.chosen === false ? ' (alternative)' : '';
      const far = farAreaRatio(s, stacks);
      return [
        s.name, s.topology + tag, s.feasible ? 'meets targets' : 'INFEASIBLE', eng(s.predicted.iout, 'A'),
        `${eng(s.predicted.rout, 'Ω')}${t ? ` (≥ ${eng(t.rout, 'Ω')})` : ''}`,
        `${formatHeadroom(s.predicted.headroom)}${t ? ` (≤ ${eng(t.headroom, 'V')})` : ''}`,
        formatArea(s.predicted.area), far === undefined ? '' : farAreaNote(far),
      ];
    }),
    highlight: ordered.map((s) => s.chosen === true),
  };
}

function stackSection(s: StackResult, input: HtmlReportInput, spec?: StackSpec): string {
  const front = input.fronts?.find((f) => f.stack === s.name)?.points;
  const charts = stackCharts(s, spec, front);
  const badge = s.feasible ? '<span class="badge ok">FEASIBLE</span>' : '<span class="badge bad">INFEASIBLE</span>';
  const sq = squareLawGrid(s);
  const corners = cornerGrid(s);
  return [
    `<section class="stack" id="${resultSlug('stack', s.name, s.topology, s.chosen)}">`,
    `<h2>${esc(s.name)} — ${esc(polarityName(s.device))} ${esc(s.topology)}${badge}</h2>`,
    `<p class="verdict${s.feasible ? '' : ' bad'}">${esc(statusLine(s))}</p>`,
    `<div class="tables">${htmlTable(deviceGrid(s), 'output stack (bottom first)')}${s.bias.length ? htmlTable(biasGrid(s), 'bias devices') : ''}</div>`,
    `<div class="tables">${htmlTable(predictedGrid(s), 'predicted')}${sq ? htmlTable(sq, 'lookup table against square law') : ''}${corners ? htmlTable(corners, 'per corner') : ''}</div>`,
    `<div class="charts">${figure(charts.rout)}${figure(charts.iout)}${figure(charts.pareto)}${figure(charts.area)}</div>`,
    simulationBlock(s, input, spec),
    '</section>',
  ].join('\n');
}

// Stages follow the stacks: spec, summary and one section each (alternatives folded away).
function stagesHtml(input: HtmlReportInput): string {
  const stages = input.size.stages ?? [];
  const specs = new Map((input.spec.parsed.stages ?? []).map((s) => [s.name, s]));
  if (stages.length === 0) return '';
  const sections = stages.map((s) => {
    const section = stageSection(s, htmlTable, specs.get(s.name), input.stageFronts?.find((f) => f.stage === s.name)?.points) + stageSimulationBlock(s, input, specs.get(s.name));
    return s.chosen === false ? `<details class="alternative"><summary>${esc(s.name)}: alternative ${esc(s.load.topology)} load (${s.feasible ? 'feasible' : 'infeasible'})</summary>${section}</details>` : section;
  });
  return `<section id="stages"><h2>Gain stages</h2>${htmlTable(stageSummaryGrid(stages, specs))}${htmlTable(stageSpecGrid([...specs.values()]), 'stage targets')}</section>\n${sections.join('\n')}`;
}

/** With `size --spice`, per stage: predicted beside simulated, the corrected widths, the simulated gain curve over the predicted and (gbw target) the simulated frequency response. */
function stageSimulationBlock(s: StageResult, input: HtmlReportInput, spec?: StageSpec): string {
  const c = s.chosen === false ? undefined : input.stageConfirmations?.find((x) => x.name === s.name);
  if (!c) return '';
  const corrected = stageCorrectedGrid(c, s);
  return [
    `<section class="stage-simulation"><h3>${esc(s.name)}: confirmed in simulation?</h3><p class="verdict${c.confirmed ? '' : ' bad'}">${esc(confirmVerdict(c))}</p>`,
    `<div class="tables">${htmlTable(stageConfirmGrid(c, s, spec), 'predicted (lookup tables) and simulated (ngspice)')}${corrected ? htmlTable(corrected, 'corrected devices') : ''}</div>`,
    `<div class="charts">${figure(stageConfirmChart(c, s, spec))}${c.simulated.response.length > 0 ? figure(stageResponseChart(c, s, spec)) : ''}</div></section>`,
  ].join('\n');
}

/** With `size --spice`: predicted beside simulated, the corrected sizes and the simulated Rout(v) over the predicted. */
function simulationBlock(s: StackResult, input: HtmlReportInput, spec?: StackSpec): string {
  const c = s.chosen === false ? undefined : input.confirmations?.find((x) => x.name === s.name);
  if (!c) return '';
  const corrected = correctedGrid(c, s);
  return [
    `<h3>Confirmed in simulation?</h3><p class="verdict${c.confirmed ? '' : ' bad'}">${esc(confirmVerdict(c))}</p>`,
    `<div class="tables">${htmlTable(confirmGrid(c, s, spec), 'predicted (lookup tables) and simulated (ngspice)')}${corrected ? htmlTable(corrected, 'corrected devices') : ''}</div>`,
    `<div class="charts">${figure(confirmRoutChart(c, s, spec))}</div>`,
  ].join('\n');
}

/**
 * One self-contained HTML page (inline CSS and SVG, no scripts, no network)
 * presenting a sizing run: the caution first, then spec, per-stack results and charts.
 */
export function htmlReport(input: HtmlReportInput): string {
  const { size, spec } = input;
  const specs = new Map(spec.parsed.stacks.map((s) => [s.name, s]));
  const design = (input.designCurves ?? []).map((dc, i) => {
    const c = designCharts(dc, `d${i}-`);
    return `<h3>${esc(`${dc.kit} · ${polarityName(dc.device)} · ${dc.corner}`)}</h3><div class="charts">${figure(c.gain)}${figure(c.jd)}${figure(c.ft)}</div>`;
  });
  const title = `stackwright sizing report — ${size.kit}`;
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="${esc(input.generatedBy)}">
<title>${esc(title)}</title>
<style>${REPORT_CSS}</style>
</head>
<body>
<main>
<header class="top">
<h1>${esc(title)}</h1>
<p class="meta">kit ${esc(size.kit)} · corners ${esc(size.corners.join(', '))} · supply ${esc(eng(size.supply, 'V'))} · spec ${esc(spec.parsed.file)}</p>
</header>
<div class="caution" role="note"><strong>CAUTION</strong>${esc(size.caution)}</div>
${input.notes?.length ? `<ul class="notes">${input.notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul>` : ''}
<section id="summary"><h2>Summary</h2>${htmlTable(summaryGrid(size.stacks, specs))}</section>
<section id="spec"><h2>Specification</h2>${htmlTable(specGrid(spec.parsed.stacks))}
<details open><summary>source of ${esc(spec.parsed.file)}</summary><pre class="source">${esc(spec.source)}</pre></details></section>
${chosenFirst(size.stacks).map((s) => {
  const section = stackSection(s, input, specs.get(s.name));
  // With topology 'auto' the alternatives are folded away under the chosen design.
  const far = farAreaRatio(s, size.stacks);
  return s.chosen === false
    ? `<details class="alternative"><summary>${esc(s.name)}: alternative ${esc(s.topology)} (${s.feasible ? 'feasible' : 'infeasible'}${far === undefined ? '' : `, <span class="far">${esc(farAreaNote(far))}</span>`})</summary>${section}</details>`
    : section;
}).join('\n')}
${stagesHtml(input)}
${design.length ? `<section id="design"><h2>Design curves of the devices used</h2>${design.join('\n')}</section>` : ''}
<footer>Generated by ${esc(input.generatedBy)}${input.generatedAt ? ` on ${esc(input.generatedAt)}` : ''}. ${esc(size.caution)}</footer>
</main>
</body>
</html>
`;
}
