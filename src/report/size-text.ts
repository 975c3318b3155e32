import type { SizeResult } from '../solve/types.js';
import { polarityName } from './format.js';
import { biasGrid, columnAlign, cornerGrid, deviceGrid, predictedGrid, squareLawGrid, verdict, type Grid } from './rows.js';
import { ansi, renderTable } from './text.js';

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
    const status = s.feasible ? ansi.green('FEASIBLE', c) : ansi.red('INFEASIBLE', c);
    out.push('', ansi.bold(`stack ${s.name}: ${polarityName(s.device)} ${s.topology} — ${status}`, c), `  ${verdict(s)}`);
    out.push(...block('output stack (bottom first)', deviceGrid(s), c));
    out.push(...block('bias devices', biasGrid(s), c));
    out.push(...block('predicted', predictedGrid(s), c));
    out.push(...block('lookup table against square law', squareLawGrid(s), c));
    out.push(...block('per corner', cornerGrid(s), c));
  }
  return out.join('\n') + '\n';
}
