import type { SizeResult } from '../solve/types.js';
import type { StageFrontPoint } from '../solve/stage-types.js';
import { decidingResults } from '../solve/choose.js';
import { eng, formatArea, formatHeadroom, formatPercent, polarityName } from './format.js';
import { formatEng } from '../units/index.js';
import { biasGrid, columnAlign, cornerGrid, currentWarning, deviceGrid, predictedGrid, squareLawGrid, statusLine, type Grid } from './rows.js';
import { ansi, renderTable, wrapText, TEXT_WIDTH } from './text.js';
import { bindingText } from './verdict.js';
import { stageCornerGrid, stageCurveGrid, stageFigures, stageFrontGrid, stagePredictedGrid, stageSquareLawGrid, stageTopologiesGrid, stageVerdict, stageVerdictText } from './stage-rows.js';
import { farAreaNote, farAreaRatio } from './order.js';

export interface SizeTextOptions {
  /** ANSI colour; the CLI passes isTTY && !NO_COLOR. */
  color: boolean;
  /** Trade fronts of the stages by name (printed when given). */
  stageFronts?: Record<string, StageFrontPoint[]>;
  /** Stage gain targets by name, to mark the gain curve. */
  stageGains?: Record<string, number>;
}

/**
 * A titled table. With `noteColumn` that column (a sentence) is printed under its row
 * instead, so tables fit TEXT_WIDTH columns.
 */
function block(title: string, grid: Grid | undefined, color: boolean, extra: { noteColumn?: number; highlight?: boolean[] } = {}): string[] {
  if (!grid || grid.rows.length === 0) return [];
  const k = extra.noteColumn;
  const keep = (r: string[]): string[] => (k === undefined ? r : r.filter((_, c) => c !== k));
  const shown: Grid = { headers: keep(grid.headers), rows: grid.rows.map(keep) };
  const notes = k === undefined ? undefined : grid.rows.map((r) => (r[k] && r[k] !== '—' ? `${grid.headers[k]}: ${r[k]}` : undefined));
  return ['', `  ${ansi.dim(title, color)}`, renderTable(shown.headers, shown.rows, { color, indent: 2, align: columnAlign(shown), notes, highlight: extra.highlight })];
}

function heading(result: SizeResult, color: boolean): string[] {
  return [
    `kit ${result.kit}, corners ${result.corners.join(', ')}, supply ${formatEng(result.supply, 'V', 4)}`,
    ansi.yellow(wrapText(`CAUTION: ${result.caution}`, TEXT_WIDTH), color),
  ];
}

/** The `size` result as fixed-width text for a terminal, at most TEXT_WIDTH columns wide. */
export function renderSizeText(result: SizeResult, opts: SizeTextOptions): string {
  const c = opts.color;
  const out: string[] = heading(result, c);
  for (const s of result.stacks) {
    // With topology 'auto' the alternatives get one line each; the chosen design gets the full account.
    if (s.chosen === false) continue;
    const status = s.feasible ? ansi.green('FEASIBLE', c) : ansi.red('INFEASIBLE', c);
    out.push('', ansi.bold(`stack ${s.name}: ${polarityName(s.device)} ${s.topology} — ${status}`, c), wrapText(statusLine(s), TEXT_WIDTH, '  '));
    const warning = currentWarning(s);
    if (warning) out.push(ansi.yellow(wrapText(warning, TEXT_WIDTH, '  '), c));
    out.push(...block('output stack (bottom first)', deviceGrid(s), c));
    out.push(...block('bias devices', biasGrid(s), c));
    out.push(...block('predicted', predictedGrid(s), c));
    out.push(...block('lookup table against square law', squareLawGrid(s), c));
    const corners = cornerGrid(s);
    out.push(...block('per corner', corners, c, { noteColumn: corners ? corners.headers.length - 1 : undefined }));
    const others = result.stacks.filter((x) => x.name === s.name && x.chosen === false);
    if (others.length > 0) {
      // The chosen design first and marked; alternatives far larger in area say so.
      const all = [s, ...others];
      const rows = all.map((x) => {
        const far = farAreaRatio(x, result.stacks);
        const why = [x.feasible ? '' : bindingText(x), far === undefined ? '' : farAreaNote(far)].filter(Boolean).join('; ');
        return [x.topology, x === s ? 'chosen' : x.feasible ? 'feasible' : 'INFEASIBLE', eng(x.predicted.rout, 'Ω'), formatHeadroom(x.predicted.headroom), formatArea(x.predicted.area), why];
      });
      out.push(...block('topologies tried (auto)', { headers: ['topology', 'status', 'Rout', 'headroom', 'area', 'why'], rows }, c, {
        noteColumn: 5, highlight: all.map((x) => x === s),
      }));
    }
  }
  out.push(...stageText(result, c, opts));
  return out.join('\n') + '\n';
}

/** The stages of a result: both sides' devices, bias, predicted figures, hand analysis, corners, load topologies tried. */
function stageText(result: SizeResult, c: boolean, opts: SizeTextOptions): string[] {
  const out: string[] = [];
  for (const s of result.stages ?? []) {
    if (s.chosen === false) continue;
    const status = s.feasible ? ansi.green('FEASIBLE', c) : ansi.red('INFEASIBLE', c);
    out.push('', ansi.bold(`stage ${s.name}: ${s.input.device}-input ${s.input.topology}, ${polarityName(s.load.device)} ${s.load.topology} load — ${status}`, c), `  ${stageVerdict(s)}`);
    out.push(...block('input side (bottom first; the input device\'s gate is the input DC voltage)', deviceGrid(s.input), c));
    out.push(...block('input-side bias devices', biasGrid(s.input), c));
    out.push(...block('load side (bottom first)', deviceGrid(s.load), c));
    out.push(...block('load-side bias devices', biasGrid(s.load), c));
    out.push(...block('predicted', stagePredictedGrid(s), c));
    out.push(...block('lookup table against square law', stageSquareLawGrid(s), c));
    out.push(...block('per corner', stageCornerGrid(s), c));
    out.push(...block('gain against output voltage (every 100 mV)', stageCurveGrid(s, opts.stageGains?.[s.name]), c));
    const front = opts.stageFronts?.[s.name];
    if (front) out.push(...block('trade front: swing against gain and area over the explored designs', stageFrontGrid(front), c));
    const all = (result.stages ?? []).filter((x) => x.name === s.name);
    if (all.length > 1) out.push(...block('load topologies tried (auto)', stageTopologiesGrid(all), c));
  }
  return out;
}

/** A length in µm without the unit (the column header carries it), 3 significant digits. */
function microns(m: number): string {
  return Number.isFinite(m) ? String(Number((m * 1e6).toPrecision(3))) : '—';
}

/** One line per stack (its chosen design), the binding target under an infeasible one: for a quick look at many stacks. */
export function renderSizeBrief(result: SizeResult, opts: SizeTextOptions): string {
  const stacks = decidingResults(result);
  const rows = stacks.map((s) => [
    s.name, `${s.device}-type ${s.topology}`, s.feasible ? 'feasible' : 'INFEASIBLE',
    s.devices.map((d) => `${microns(d.w)}/${microns(d.l)}`).join(' + ') || '—',
    eng(s.predicted.iout, 'A'), eng(s.predicted.rout, 'Ω'), formatHeadroom(s.predicted.headroom),
    formatArea(s.predicted.area), s.predicted.sigma === undefined ? '—' : formatPercent(s.predicted.sigma),
  ]);
  const stages = (result.stages ?? []).filter((s) => s.chosen !== false).map((s) => {
    const f = stageFigures(s);
    return [
      s.name, `${s.input.device}-input ${s.input.topology} / ${s.load.device}-type ${s.load.topology}`, s.feasible ? 'feasible' : 'INFEASIBLE',
      f.gain, f.swing, f.area, s.feasible || !s.binding ? '' : stageVerdictText(s.binding, result.corners.length > 1),
    ];
  });
  const stageLines = stages.length === 0 ? [] : [renderTable(['stage', 'topology', 'status', 'gain', 'swing', 'area', 'binding'], stages, {
    color: opts.color, align: ['left', 'left', 'left', 'right', 'right', 'right', 'left'],
  })];
  // A spec of stages only has no stack table (an empty one would read as stacks that produced nothing).
  const stackLines = rows.length === 0 && stageLines.length > 0 ? [] : [renderTable(['stack', 'topology', 'status', 'W/L in µm, bottom first', 'Iout', 'Rout', 'headroom', 'area', 'σ(I)/I'], rows, {
    color: opts.color, align: ['left', 'left', 'left', 'left', 'right', 'right', 'right', 'right', 'right'],
    notes: stacks.map((s) => (s.feasible ? undefined : `binding: ${bindingText(s) || 'targets not met'}`)),
  })];
  return [
    ...heading(result, opts.color),
    ...stackLines,
    ...stageLines,
  ].join('\n') + '\n';
}
