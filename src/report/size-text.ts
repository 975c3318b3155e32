import type { SizeResult } from '../solve/types.js';
import { decidingResults } from '../solve/choose.js';
import { formatArea, polarityName } from './format.js';
import { formatEng } from '../units/index.js';
import { biasGrid, columnAlign, cornerGrid, currentWarning, deviceGrid, predictedGrid, squareLawGrid, statusLine, type Grid } from './rows.js';
import { ansi, renderTable } from './text.js';
import { bindingText } from './verdict.js';

export interface SizeTextOptions {
  /** ANSI colour; the CLI passes isTTY && !NO_COLOR. */
  color: boolean;
}

function block(title: string, grid: Grid | undefined, color: boolean): string[] {
  if (!grid || grid.rows.length === 0) return [];
  return ['', `  ${ansi.dim(title, color)}`, renderTable(grid.headers, grid.rows, { color, indent: 2, align: columnAlign(grid) })];
}

/** The `size` result as fixed-width text for a terminal. */
export function renderSizeText(result: SizeResult, opts: SizeTextOptions): string {
  const c = opts.color;
  const out: string[] = [
    `kit ${result.kit}, corners ${result.corners.join(', ')}, supply ${result.supply} V`,
    ansi.yellow(`CAUTION: ${result.caution}`, c),
  ];
  for (const s of result.stacks) {
    // With topology 'auto' the alternatives get one line each; the chosen design gets the full account.
    if (s.chosen === false) continue;
    const status = s.feasible ? ansi.green('FEASIBLE', c) : ansi.red('INFEASIBLE', c);
    out.push('', ansi.bold(`stack ${s.name}: ${polarityName(s.device)} ${s.topology} — ${status}`, c), `  ${statusLine(s)}`);
    const warning = currentWarning(s);
    if (warning) out.push(`  ${ansi.yellow(warning, c)}`);
    out.push(...block('output stack (bottom first)', deviceGrid(s), c));
    out.push(...block('bias devices', biasGrid(s), c));
    out.push(...block('predicted', predictedGrid(s), c));
    out.push(...block('lookup table against square law', squareLawGrid(s), c));
    out.push(...block('per corner', cornerGrid(s), c));
    const others = result.stacks.filter((x) => x.name === s.name && x.chosen === false);
    if (others.length > 0) {
      const rows = [s, ...others].map((x) => [
        x.topology, x === s ? 'chosen' : x.feasible ? 'feasible' : 'INFEASIBLE', formatEng(x.predicted.rout, 'Ω'),
        Number.isFinite(x.predicted.headroom) ? formatEng(x.predicted.headroom, 'V') : 'never', formatArea(x.predicted.area),
        x.feasible ? '' : bindingText(x),
      ]);
      out.push(...block('topologies tried (auto)', { headers: ['topology', 'status', 'Rout', 'headroom', 'area', 'binding'], rows }, c));
    }
  }
  return out.join('\n') + '\n';
}

/** One line per stack (its chosen design): for a quick look at many stacks. */
export function renderSizeBrief(result: SizeResult, opts: SizeTextOptions): string {
  const rows = decidingResults(result).map((s) => [
    s.name, `${s.device}-type ${s.topology}`, s.feasible ? 'feasible' : 'INFEASIBLE',
    s.devices.map((d) => `${formatEng(d.w, 'm')}/${formatEng(d.l, 'm')}`).join(' + '),
    formatEng(s.predicted.iout, 'A'), formatEng(s.predicted.rout, 'Ω'),
    Number.isFinite(s.predicted.headroom) ? formatEng(s.predicted.headroom, 'V') : 'never',
    formatArea(s.predicted.area), s.predicted.sigma === undefined ? '—' : `${Number((s.predicted.sigma * 100).toPrecision(3))} %`,
    s.feasible ? '' : bindingText(s),
  ]);
  return [
    `kit ${result.kit}, corners ${result.corners.join(', ')}, supply ${result.supply} V`,
    ansi.yellow(`CAUTION: ${result.caution}`, opts.color),
    renderTable(['stack', 'topology', 'status', 'W/L (bottom first)', 'Iout', 'Rout', 'headroom', 'area', 'σ(Iout)/Iout', 'binding'], rows, {
      color: opts.color, align: ['left', 'left', 'left', 'left', 'right', 'right', 'right', 'right', 'right', 'left'],
    }),
  ].join('\n') + '\n';
}
