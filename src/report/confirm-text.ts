import type { DesignSpec } from '../design/types.js';
import type { SizeResult } from '../solve/types.js';
import { decidingResults } from '../solve/choose.js';
import type { Confirmation } from '../confirm/types.js';
import type { StageConfirmation } from '../confirm/stage-types.js';
import { decidingStages } from '../solve/stage-choose.js';
import { stageConfirmGrid, stageCorrectedGrid } from './confirm-stage.js';
import { confirmGrid, confirmVerdict, correctedGrid, specOf } from './confirm-rows.js';
import { columnAlign, type Grid } from './rows.js';
import { ansi, renderTable } from './text.js';

function block(title: string, grid: Grid | undefined, color: boolean): string[] {
  if (!grid || grid.rows.length === 0) return [];
  return ['', `  ${ansi.dim(title, color)}`, renderTable(grid.headers, grid.rows, { color, indent: 2, align: columnAlign(grid) })];
}

/** Predicted beside simulated for every confirmed (or not) stack, as text. */
export function renderConfirmText(confirmations: readonly Confirmation[], result: SizeResult, spec: DesignSpec, opts: { color: boolean }, stages: readonly StageConfirmation[] = []): string {
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
  const chosenStages = decidingStages(result);
  for (const k of stages) {
    const verdict = confirmVerdict(k);
    out.push('', ansi.bold(`stage ${k.name}: `, c) + (k.confirmed ? ansi.green(verdict, c) : ansi.red(verdict, c)));
    const stage = chosenStages.find((s) => s.name === k.name);
    out.push(...block('predicted and simulated', stageConfirmGrid(k, stage, spec.stages?.find((s) => s.name === k.name)), c));
    out.push(...block('corrected devices (diode-biased as simulated)', stageCorrectedGrid(k, stage), c));
  }
  return out.join('\n') + '\n';
}
