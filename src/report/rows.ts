import type { StackResult } from '../solve/types.js';
import { verdictText, bindingText, volts } from './verdict.js';
import { eng, formatArea, formatHeadroom, formatPercent, perVolt } from './format.js';

/** Cells that start with a digit or sign are numbers (aligned right). */
export function isNumericCell(cell: string): boolean {
  return /^[-+−]?\d/.test(cell);
}

// Placeholders that may stand in a numeric column.
const BLANKS = new Set(['—', 'never']);

/** Right-align a column when its cells are numbers (placeholders allowed); the first column is always a label. */
export function columnAlign(grid: Grid): Array<'left' | 'right'> {
  return grid.headers.map((_, c) => {
    if (c === 0) return 'left';
    const cells = grid.rows.map((r) => r[c]);
    const numeric = cells.every((v) => isNumericCell(v) || BLANKS.has(v)) && cells.some(isNumericCell);
    return numeric ? 'right' : 'left';
  });
}

/** Headers + cells of one table, shared by the text and HTML renderers. */
export interface Grid {
  headers: string[];
  rows: string[][];
  /** Per row: emphasised (the chosen design), where the renderer can show it. */
  highlight?: boolean[];
}

/** Output-stack devices, bottom first. */
export function deviceGrid(stack: Pick<StackResult, 'devices'>): Grid {
  return {
    headers: ['device', 'W', 'L', 'gate', 'VGS', 'VDS', 'VDSsat', 'VSB', 'gm/ID', 'ID', 'gm', 'gds', 'gm/gds'],
    rows: stack.devices.map((d) => [
      d.role, eng(d.w, 'm'), eng(d.l, 'm'), eng(d.gate, 'V'), eng(d.vgs, 'V'), eng(d.vds, 'V'),
      d.vdsat === undefined ? '—' : eng(d.vdsat, 'V'), eng(d.vsb, 'V'),
      perVolt(d.gmid), eng(d.id, 'A'), eng(d.gm, 'S'), eng(d.gds, 'S'), eng(d.gain, ''),
    ]),
  };
}

export function biasGrid(stack: Pick<StackResult, 'bias'>): Grid {
  return {
    headers: ['bias for', 'W', 'L', 'current', 'gate voltage', 'stacked on'],
    rows: stack.bias.map((b) => [
      `${b.drives} gate`, eng(b.w, 'm'), eng(b.l, 'm'), eng(b.current, 'A'), eng(b.voltage, 'V'),
      b.stackedOn === undefined ? '—' : `bias ${b.stackedOn + 1} (${stack.bias[b.stackedOn]?.drives ?? '?'})`,
    ]),
  };
}

export function predictedGrid(stack: StackResult): Grid {
  const p = stack.predicted;
  const rows = [
    ['Iout at mid-span', eng(p.iout, 'A')],
    ['lowest Rout over span', eng(p.rout, 'Ω')],
    ['headroom', formatHeadroom(p.headroom)],
    ['output-stack area', formatArea(p.area)],
    ['bias area', formatArea(p.biasArea)],
  ];
  if (p.sigma !== undefined) rows.push(['σ(Iout)/Iout', formatPercent(p.sigma)]);
  rows.push(['candidates evaluated', String(stack.evaluated)]);
  return { headers: ['quantity', 'value'], rows };
}

/**
 * Lookup-table result beside the square-law estimate. The table's overdrive is
 * shown as 2/(gm/ID), the square-law relation gm/ID = 2/Vov (common practice),
 * so the two columns compare like with like.
 */
export function squareLawGrid(stack: StackResult): Grid | undefined {
  const s = stack.squareLaw;
  if (!s) return undefined;
  const rows: string[][] = [['Vth (square-law fit)', '—', eng(s.vth, 'V')]];
  stack.devices.forEach((d, i) => {
    rows.push([`VGS ${d.role}`, eng(d.vgs, 'V'), eng(s.vgs[i] ?? NaN, 'V')]);
    rows.push([`Vov ${d.role} (table: 2/(gm/ID))`, eng(2 / d.gmid, 'V'), eng(s.vov[i] ?? NaN, 'V')]);
    rows.push([`λ ${d.role} (gds/ID)`, perVolt(d.gds / d.id), perVolt(s.lambda[i] ?? NaN)]);
  });
  rows.push(['headroom', formatHeadroom(stack.predicted.headroom), eng(s.headroom, 'V')]);
  rows.push(['Rout', eng(stack.predicted.rout, 'Ω'), eng(s.rout, 'Ω')]);
  return { headers: ['quantity', 'lookup table', 'square law'], rows };
}

export function cornerGrid(stack: StackResult): Grid | undefined {
  if (!stack.corners || stack.corners.length === 0) return undefined;
  return {
    headers: ['corner', 'meets targets', 'Iout', 'Rout', 'headroom', 'bias gates', 'binding / tightest'],
    rows: stack.corners.map((c) => [
      c.corner, c.feasible ? 'yes' : 'NO', eng(c.predicted.iout, 'A'), eng(c.predicted.rout, 'Ω'), formatHeadroom(c.predicted.headroom),
      c.gates.map((g) => eng(g, 'V')).join(', ') || '—', c.binding ? verdictText(c.binding) : c.tightest ? verdictText(c.tightest) : '—',
    ]),
  };
}

/** A warning when the target current is above what the tables carry at the width limit, else undefined. */
export function currentWarning(stack: StackResult): string | undefined {
  if (stack.currentLimit === undefined || stack.wmax === undefined) return undefined;
  return `warning: the target current is above the ${eng(stack.currentLimit, 'A')} the kit's tables carry through one device at the ${eng(stack.wmax, 'm')} width limit (spec key wmax)`;
}

/** One sentence on feasibility, the binding target and the nearest reachable points. */
export function statusLine(stack: StackResult): string {
  const tag = stack.chosen === true ? ' (chosen by the objective)' : stack.chosen === false ? ' (alternative)' : '';
  if (stack.feasible) return `meets all targets${tag}`;
  const parts = [`does not meet the targets${stack.binding ? `: ${bindingText(stack)}` : ''}`];
  const n = stack.nearest;
  // With several corners the nearest points are the nominal corner's: say so, or they read as contradicting a miss
  // at another corner.
  const at = n?.corner !== undefined && (stack.corners?.length ?? 0) > 1 ? ` at corner ${n.corner}` : '';
  if (n?.headroomAtRout !== undefined && Number.isFinite(n.headroomAtRout)) {
    parts.push(`the Rout target needs ${volts(n.headroomAtRout)} of headroom at best${at}`);
  } else if (n !== undefined && stack.binding?.target === 'rout') {
    parts.push(`no allowed design reaches the Rout target at any headroom up to the span${at}`);
  }
  if (n?.routAtHeadroom !== undefined && n.routAtHeadroom > 0) parts.push(`at the headroom target Rout reaches ${eng(n.routAtHeadroom, 'Ω')}${at}`);
  const all = n?.overCorners;
  if (all) {
    // The figures that answer "what would meet the targets at every corner": each design at its worst corner.
    // Rout 0: no allowed design keeps its current window and saturation at every corner at all.
    if (!(all.routAtHeadroom > 0)) parts.push('at every corner at once, no allowed design keeps its current within the window with its devices saturated');
    else {
      const h = Number.isFinite(all.headroomAtRout) ? `needs ${volts(all.headroomAtRout)} of headroom at best` : 'is reached by no allowed design up to the span';
      parts.push(`at every corner at once, the Rout target ${h} and Rout at the headroom target reaches ${eng(all.routAtHeadroom, 'Ω')}`);
    }
  }
  return parts.join('; ') + tag;
}
