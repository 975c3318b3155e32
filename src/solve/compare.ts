import type { StackSpec } from '../design/types.js';
import type { DeviceResult, StackResult } from './types.js';
import type { Verdict } from './evaluate/verdict.js';
import type { Role } from '../stack/types.js';

/** One compared number: old, new and the change in percent (NaN when undefined). */
export interface Change {
  what: string;
  unit: string;
  from: number;
  to: number;
  percent: number;
}

/** One compared number with its change in percent. */
export function change(what: string, unit: string, from: number, to: number): Change {
  const percent = Number.isFinite(from) && Number.isFinite(to) && from !== 0 ? (100 * (to - from)) / Math.abs(from) : NaN;
  return { what, unit, from, to, percent };
}

const ROLE_ORDER: readonly Role[] = ['bottom', 'middle', 'top'];

/** Roles present on either side, once each, from the rail outwards. */
export function rolesOf(a: readonly Role[], b: readonly Role[]): Role[] {
  const present = new Set([...a, ...b]);
  return [...ROLE_ORDER.filter((r) => present.has(r)), ...[...present].filter((r) => !ROLE_ORDER.includes(r))];
}

/**
 * W, L, gm/ID and gate (and VDS with `vds`) of two device lists, matched by role and labelled
 * `${prefix}${role}`: a role on one side only is NaN on the other.
 */
export function deviceChanges(from: readonly DeviceResult[], to: readonly DeviceResult[], prefix: string, vds: boolean): Change[] {
  const rows: Change[] = [];
  for (const r of rolesOf(from.map((d) => d.role), to.map((d) => d.role))) {
    const a = from.find((d) => d.role === r);
    const b = to.find((d) => d.role === r);
    const role = `${prefix}${r}`;
    rows.push(change(`${role} W`, 'm', a?.w ?? NaN, b?.w ?? NaN));
    rows.push(change(`${role} L`, 'm', a?.l ?? NaN, b?.l ?? NaN));
    rows.push(change(`${role} gm/ID`, '1/V', a?.gmid ?? NaN, b?.gmid ?? NaN));
    rows.push(change(`${role} gate`, 'V', a?.gate ?? NaN, b?.gate ?? NaN));
    if (vds) rows.push(change(`${role} VDS`, 'V', a?.vds ?? NaN, b?.vds ?? NaN));
  }
  return rows;
}

/** Every size, bias, Rout, headroom, area and mismatch of two designs of one stack, side by side. */
export function compareResults(from: StackResult, to: StackResult): Change[] {
  const rows: Change[] = [];
  // Rows are matched by role, not position: a cascode's top is a triple's top, and a role
  // on one side only (the triple's middle) is NaN on the other.
  rows.push(...deviceChanges(from.devices, to.devices, '', true));
  for (const role of rolesOf(from.bias.map((b) => b.drives), to.bias.map((b) => b.drives))) {
    const a = from.bias.find((x) => x.drives === role);
    const b = to.bias.find((x) => x.drives === role);
    rows.push(change(`bias(${role}) W`, 'm', a?.w ?? NaN, b?.w ?? NaN));
    rows.push(change(`bias(${role}) L`, 'm', a?.l ?? NaN, b?.l ?? NaN));
    rows.push(change(`bias(${role}) voltage`, 'V', a?.voltage ?? NaN, b?.voltage ?? NaN));
  }
  const p = from.predicted;
  const q = to.predicted;
  rows.push(change('Iout', 'A', p.iout, q.iout));
  rows.push(change('Rout', 'Ω', p.rout, q.rout));
  rows.push(change('headroom', 'V', p.headroom, q.headroom));
  rows.push(change('area', 'm²', p.area, q.area));
  rows.push(change('bias area', 'm²', p.biasArea, q.biasArea));
  rows.push(change('σ(Iout)/Iout', '', p.sigma ?? NaN, q.sigma ?? NaN));
  return rows;
}

/**
 * One target that got harder on the new kit, as data in SI units (sentences are made in src/report).
 * `rout`: Rout in Ω with its margin predicted/required (×); `headroom`: headroom in V with its slack
 * required − headroom in V (null when the headroom is never reached); `mismatch`: σ(Iout)/Iout as a fraction;
 * `area`: m² with the ratio new/old; `feasible`: the new design is infeasible, `binding` says why.
 */
export type Harder =
  | { quantity: 'feasible'; from: boolean; to: boolean; binding: Verdict | null }
  | { quantity: 'rout'; required: number; from: number; to: number; fromMargin: number; toMargin: number }
  | { quantity: 'headroom'; required: number; from: number | null; to: number | null; fromSlack: number | null; toSlack: number | null }
  | { quantity: 'mismatch'; required: number; from: number; to: number }
  | { quantity: 'area'; from: number; to: number; ratio: number }
  | { quantity: 'topology'; from: string; to: string };

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * Targets whose margin shrank on the new kit: Rout (predicted/target), headroom
 * (target − provided), mismatch (σ above the old), and area growth as a cost.
 */
export function harderTargets(spec: StackSpec, from: StackResult, to: StackResult): Harder[] {
  const out: Harder[] = [];
  const p = from.predicted;
  const q = to.predicted;
  if (!to.feasible) out.push({ quantity: 'feasible', from: from.feasible, to: false, binding: to.binding ?? null });
  const routMargin = (x: number): number => x / spec.rout;
  // The search finds Rout within 5 % of the optimum (README, tests/optimal.test.ts): a smaller drop says nothing about the kit.
  if (routMargin(q.rout) < routMargin(p.rout) * 0.95) {
    out.push({ quantity: 'rout', required: spec.rout, from: p.rout, to: q.rout, fromMargin: routMargin(p.rout), toMargin: routMargin(q.rout) });
  }
  const headSlack = (x: number): number => spec.headroom - x;
  if (headSlack(q.headroom) < headSlack(p.headroom) - 1e-3) {
    out.push({
      quantity: 'headroom', required: spec.headroom, from: finiteOrNull(p.headroom), to: finiteOrNull(q.headroom),
      fromSlack: finiteOrNull(headSlack(p.headroom)), toSlack: finiteOrNull(headSlack(q.headroom)),
    });
  }
  if (spec.mismatch !== undefined && p.sigma !== undefined && q.sigma !== undefined && q.sigma > p.sigma * 1.001) {
    out.push({ quantity: 'mismatch', required: spec.mismatch, from: p.sigma, to: q.sigma });
  }
  if (q.area > p.area * 1.2) out.push({ quantity: 'area', from: p.area, to: q.area, ratio: q.area / p.area });
  if (from.topology !== to.topology) out.push({ quantity: 'topology', from: from.topology, to: to.topology });
  return out;
}
