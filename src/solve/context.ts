import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';
import type { StackSpec } from '../spec/types.js';
import type { MismatchCoefficients } from '../table/types.js';
import type { KitAccess } from './kit.js';
import { gmidGrid, lengthGrid } from './grid.js';

/** Everything one stack's search shares: spec, kit, grids, slice cache and counters. */
export interface SolveContext {
  spec: StackSpec;
  kit: KitAccess;
  supply: number;
  /** Corners to meet; corners[0] is the one sized on. */
  corners: string[];
  nominal: string;
  /** Mid-span stack voltage, V. */
  vmid: number;
  /** Bias branch current, A. */
  ib: number;
  coeff?: MismatchCoefficients;
  lengths: number[];
  gmids: number[];
  /** Spacing of the gm/ID grid, 1/V (refinement halves it). */
  gmidStep: number;
  slice(corner: string, l: number): LengthSlice;
  count: { screened: number; exact: number };
}

/** Build the context; throws input errors for a spec the kit cannot serve. */
export function makeContext(spec: StackSpec, kit: KitAccess, supply: number, corners: string[]): SolveContext {
  const where = `stack "${spec.name}"`;
  if (corners.length === 0) throw new StackwrightError('no corner to size on', { where });
  for (const c of corners) {
    if (!kit.corners.includes(c)) throw new StackwrightError(`corner "${c}" is not in kit ${kit.kit} (has ${kit.corners.join(', ')})`, { where });
  }
  if (!(spec.headroom < spec.span)) throw new StackwrightError(`headroom ${spec.headroom} V must be below span ${spec.span} V`, { where: `${where}.headroom` });
  if (spec.span > supply + 1e-12) throw new StackwrightError(`span ${spec.span} V exceeds the supply ${supply} V`, { where: `${where}.span` });
  const coeff = kit.mismatch(spec.device);
  if (coeff && !(coeff.avt >= 0 && coeff.abeta >= 0)) {
    throw new StackwrightError(`kit ${kit.kit} has unusable Pelgrom coefficients for ${spec.device}-type devices (avt ${coeff.avt}, abeta ${coeff.abeta}; SI expected)`, { where });
  }
  if (spec.mismatch !== undefined && !coeff) {
    throw new StackwrightError(`a mismatch target is set but kit ${kit.kit} has no Pelgrom coefficients for ${spec.device}-type devices`, { where: `${where}.mismatch` });
  }
  const cache = new Map<string, LengthSlice>();
  const slice = (corner: string, l: number): LengthSlice => {
    const key = `${corner}|${l}`;
    let s = cache.get(key);
    if (!s) {
      s = kit.slice(corner, spec.device, l);
      cache.set(key, s);
    }
    return s;
  };
  const nominal = corners[0];
  const vmid = 0.5 * (spec.headroom + spec.span);
  const lengths = lengthGrid(spec, kit.lengths(nominal, spec.device), where);
  const { values: gmids, step: gmidStep } = gmidGrid(spec, lengths.map((l) => slice(nominal, l)), vmid, where);
  return {
    spec, kit, supply, corners, nominal, vmid,
    ib: spec.biasCurrent ?? spec.current,
    coeff, lengths, gmids, gmidStep, slice,
    count: { screened: 0, exact: 0 },
  };
}
