import type { DesignSpec } from '../design/types.js';
import type { SizeResult } from '../solve/types.js';
import { decidingResults } from '../solve/choose.js';
import type { Confirmation } from '../confirm/types.js';
import { confirmGrid, confirmVerdict, correctedGrid, specOf } from './confirm-rows.js';
import { columnAlign, type Grid } from './rows.js';
import { ansi, renderTable } from './text.js';

function block(title: string, grid: Grid | undefined, color: boolean): string[] {
  if (!grid || grid.rows.length === 0) return [];
  return ['', `  ${ansi.dim(title, color)}`, renderTable(grid.headers, grid.rows, { color, indent: 2, align: columnAlign(grid) })];
}

/** Predicted beside simulated for every confirmed (or not) stack, as text. */
export function renderConfirmText(confirmations: readonly Confirmation[], result: SizeResult, spec: DesignSpec, opts: { color: boolean }): string {
  const c = opts.color;
  const out: string[] = ['', ansi.bold(`simulation (ngspice, corners ${result.corners.join(', ')}): tables predicted, ngspice simulated`, c)];
  const chosen = decidingResults(result);
  for (const k of confirmations) {
    const stack = chosen.find((s) => s.name === k.name);
    const verdict = confirmVerdict(k);
    out.push('', ansi.bold(`stack ${k.name}: `, c) + (k.confirmed ? ansi.green(verdict, c) : ansi.red(verdict, c)));
    out.push(...block('predicted and simulated', confirmGrid(k, stack, specOf(spec, k.name)), c));
    out.push(...block('corrected devices (diode-biased as simulated)', correctedGrid(k, stack), c));
  }
  return out.join('\n') + '\n';
}
