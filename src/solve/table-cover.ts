import { StackwrightError } from '../errors.js';
import type { StackSpec } from '../spec/types.js';
import { formatEng } from '../units/index.js';
import type { Polarity } from '../table/types.js';
import type { KitAccess } from './kit.js';

/** Voltage ranges a device table covers at one corner, V. */
export interface TableCover {
  vds: [number, number];
  vsb: [number, number];
}

/** What the `device` table at `corner` covers (read from a slice at its shortest length). */
export function tableCover(kit: KitAccess, corner: string, device: Polarity): TableCover {
  const lengths = kit.lengths(corner, device);
  const r = kit.slice(corner, device, lengths[0]).range;
  return { vds: [r.vds[0], r.vds[1]], vsb: [r.vsb[0], r.vsb[1]] };
}

/** Highest VDS every table of the kit at these corners covers, V. */
export function kitVdsTop(kit: KitAccess, corners: readonly string[]): number {
  let top = Infinity;
  for (const c of corners) {
    for (const d of ['n', 'p'] as const) {
      let cover: TableCover;
      try {
        cover = tableCover(kit, c, d);
      } catch {
        continue; // a kit may hold one polarity only
      }
      top = Math.min(top, cover.vds[1]);
    }
  }
  return top;
}

const V = (x: number): string => formatEng(x, 'V', 4);
// Rounding in a table's axis must not refuse a span equal to its top.
const TOL = 1e-9;

/**
 * Refuse, as bad input, a stack the tables cannot describe at all: a span above
 * the tables' VDS axis (every design would be read outside the table), or a
 * stacked topology on tables without VSB data (the upper devices' sources sit
 * above the rail). `where` is the stack's spec location.
 */
export function checkTableCover(stack: StackSpec, kit: KitAccess, corners: readonly string[], supply: number, where: string): void {
  for (const corner of corners) {
    const cover = tableCover(kit, corner, stack.device);
    const table = `kit ${kit.kit}, ${stack.device}-type, corner ${corner}`;
    if (stack.span > cover.vds[1] * (1 + TOL)) {
      const fromSupply = stack.span === supply ? ' (the span is the supply when not given)' : '';
      throw new StackwrightError(
        `span ${V(stack.span)}${fromSupply} is above the tables' VDS range, which ends at ${V(cover.vds[1])} (${table}); lower the ${fromSupply ? 'supply or set a span' : 'span'}`,
        { where: `${where}.span` },
      );
    }
    if (stack.topology !== 'single' && !(cover.vsb[1] > 0)) {
      throw new StackwrightError(
        `topology ${stack.topology} needs VSB data for its upper devices (their sources sit above the rail), ` +
          `but the table's vsb axis holds ${V(cover.vsb[0])} only (${table}); characterise with VSB steps up to about ${V(stack.span)}, or use topology: single`,
        { where: `${where}.topology` },
      );
    }
  }
}
