import type { StageSpec } from '../design/types.js';
import type { StageFrontPoint, StageResult } from '../solve/stage-types.js';
import { eng, formatMicrons } from './format.js';
import { biasGrid, deviceGrid, type Grid } from './rows.js';
import { stageCharts } from './stage-charts.js';
import { stageCornerGrid, stageFigures, stagePredictedGrid, stageSquareLawGrid, stageVerdict } from './stage-rows.js';
import { escapeXml as esc, resultSlug } from './svg.js';

type Table = (grid: Grid, caption?: string) => string;

function figure(svg: string | undefined): string {
  return svg ? `<figure>${svg}</figure>` : '';
}

/** The stages' targets as the spec gives them. */
export function stageSpecGrid(stages: readonly StageSpec[]): Grid {
  const range = (r: StageSpec['input']['l']) => (r ? `${formatMicrons(r.min)} – ${formatMicrons(r.max)}` : 'table lengths');
  return {
    headers: ['stage', 'input', 'load', 'current', 'gain ≥', 'swing ≥', 'output', 'GBW ≥', 'cap', 'input L', 'load L', 'objective'],
    rows: stages.map((s) => [
      s.name, `${s.input.device}-type ${s.input.topology}`, `${s.input.device === 'n' ? 'p' : 'n'}-type ${s.load.topology}`, eng(s.current, 'A'),
      String(s.gain), eng(s.swing, 'V'), eng(s.output, 'V'), s.gbw === undefined ? '—' : eng(s.gbw, 'Hz'), s.cap === undefined ? '—' : eng(s.cap, 'F'),
      range(s.input.l), range(s.load.l), s.objective,
    ]),
  };
}

/** One stage: verdict, both sides' devices and bias, predicted figures, hand analysis, corners, gain curve and trade front. */
export function stageSection(s: StageResult, table: Table, spec?: StageSpec, front?: StageFrontPoint[]): string {
  const charts = stageCharts(s, spec, front);
  const badge = s.feasible ? '<span class="badge ok">FEASIBLE</span>' : '<span class="badge bad">INFEASIBLE</span>';
  const sq = stageSquareLawGrid(s);
  const corners = stageCornerGrid(s);
  return [
    `<section class="stack" id="${resultSlug('stage', s.name, s.load.topology, s.chosen)}">`,
    `<h2>${esc(s.name)} — gain stage: ${esc(`${s.input.device}-input ${s.input.topology}, ${s.load.device}-type ${s.load.topology} load`)}${badge}</h2>`,
    `<p class="verdict${s.feasible ? '' : ' bad'}">${esc(stageVerdict(s))}</p>`,
    `<div class="tables">${table(deviceGrid(s.input), 'input side (bottom first; gate of the input device = input DC voltage)')}${s.input.bias.length ? table(biasGrid(s.input), 'input-side bias devices') : ''}</div>`,
    `<div class="tables">${table(deviceGrid(s.load), 'load side (bottom first)')}${s.load.bias.length ? table(biasGrid(s.load), 'load-side bias devices') : ''}</div>`,
    `<div class="tables">${table(stagePredictedGrid(s), 'predicted')}${sq ? table(sq, 'lookup table against square law') : ''}${corners ? table(corners, 'per corner') : ''}</div>`,
    `<div class="charts">${figure(charts.gain)}${figure(charts.trade)}${figure(charts.area)}</div>`,
    '</section>',
  ].join('\n');
}

/** Summary rows of the stages (one per load topology tried). */
export function stageSummaryGrid(stages: readonly StageResult[], specs: Map<string, StageSpec>): Grid {
  return {
    headers: ['stage', 'load topology', 'result', 'gain (target)', 'swing (target)', 'area'],
    rows: stages.map((s) => {
      const t = specs.get(s.name);
      const tag = s.chosen === true ? ' (chosen)' : s.chosen === false ? ' (alternative)' : '';
      const f = stageFigures(s);
      return [
        s.name, s.load.topology + tag, s.feasible ? 'meets targets' : 'INFEASIBLE',
        `${f.gain}${t ? ` (≥ ${t.gain})` : ''}`, `${f.swing}${t ? ` (≥ ${eng(t.swing, 'V')})` : ''}`, f.area,
      ];
    }),
  };
}
