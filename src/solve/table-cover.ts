import { StackwrightError } from '../errors.js';
import type { StackSpec, StageSpec } from '../design/types.js';
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

/**
 * Refuse, as bad input, a gain stage the tables cannot describe: the output swings
 * between the rails, so one side's devices see up to the whole supply across them;
 * a supply above either polarity's VDS axis would be read outside the table.
 * A cascoded side (input cascode, or a load other than single) on tables without
 * VSB data is refused as a stack is: its upper devices' sources sit above the rail.
 * `where` locates the supply, `at` the stage (e.g. "spec.yaml: stages[0]").
 */
export function checkStageCover(stage: StageSpec, kit: KitAccess, corners: readonly string[], supply: number, where: string, at = `stage "${stage.name}"`): void {
  const load: Polarity = stage.input.device === 'n' ? 'p' : 'n';
  const sides = [
    { side: 'input', device: stage.input.device, topology: stage.input.topology as string },
    { side: 'load', device: load, topology: stage.load.topology as string },
  ];
  for (const corner of corners) {
    for (const { side, device, topology } of sides) {
      const cover = tableCover(kit, corner, device);
      const table = `kit ${kit.kit}, ${device}-type, corner ${corner}`;
      if (supply > cover.vds[1] * (1 + TOL)) {
        throw new StackwrightError(
          `supply ${V(supply)} is above the tables' VDS range, which ends at ${V(cover.vds[1])} (${table}); ` +
            `stage "${stage.name}" swings its output between the rails, so lower the supply`,
          { where },
        );
      }
      if (topology !== 'single' && !(cover.vsb[1] > 0)) {
        throw new StackwrightError(
          `stage "${stage.name}" ${side} side: topology ${topology} needs VSB data for its upper devices (their sources sit above the rail), ` +
            `but the table's vsb axis holds ${V(cover.vsb[0])} only (${table}); characterise with VSB steps up to about ${V(supply)}, or use topology: single`,
          { where: `${at}.${side}.topology` },
        );
      }
    }
  }
}

/** A spec length range that reaches outside the table, and the part of it that is used. */
export interface LengthClamp {
  stack: string;
  corner: string;
  /** The spec's l range, m. */
  asked: [number, number];
  /** The table's length axis, m. */
  table: [number, number];
  /** What sizing searches: the overlap, m. */
  used: [number, number];
}

/** Stacks whose spec `l` range extends beyond the table lengths (sizing never extrapolates, so it keeps to the table). */
export function lengthClamps(stacks: readonly StackSpec[], kit: KitAccess, corner: string): LengthClamp[] {
  const out: LengthClamp[] = [];
  for (const s of stacks) {
    if (!s.l) continue;
    const ls = kit.lengths(corner, s.device);
    const lo = ls[0];
    const hi = ls[ls.length - 1];
    if (s.l.min >= lo * (1 - TOL) && s.l.max <= hi * (1 + TOL)) continue;
    out.push({ stack: s.name, corner, asked: [s.l.min, s.l.max], table: [lo, hi], used: [Math.max(s.l.min, lo), Math.min(s.l.max, hi)] });
  }
  return out;
}
