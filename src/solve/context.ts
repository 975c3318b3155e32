import { StackwrightError } from '../errors.js';
import type { LengthSlice } from '../device/types.js';
import type { StackSpec } from '../design/types.js';
import type { MismatchCoefficients } from '../table/types.js';
import { cornerUt } from './evaluate/temperature.js';
import { midSpan } from '../policy.js';
import type { KitAccess } from './kit.js';
import { gmidGrid, lengthGrid } from './search/grid.js';
import { formatEng } from '../units/index.js';
import { widthLimit } from './width.js';
import type { Reuse } from './search/reuse.js';

/** Highest current density the slice reaches (top of its VGS and VDS axes, VSB = 0), A/m. */
function peakDensity(s: LengthSlice): number {
  return s.jd(s.range.vgs[1], s.range.vds[1], s.range.vsb[0]);
}

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
  /** Narrowest drawable width: the kit's shortest table length (common practice: minimum W and L are of the same order). */
  wmin: number;
  /** Widest allowed output device (spec `wmax` or the kit's default), m; also in `spec.wmax`. */
  wmax: number;
  /** Highest current the nominal tables carry through one device at the width limit, A. */
  currentLimit: number;
  /** Thermal voltage kT/q at a corner's table temperature (27 °C when unknown), V. */
  ut(corner: string): number;
  /**
   * Lower devices below VDSsat at mid-span: 'require' rejects the candidate; 'report' keeps it as
   * infeasible (only to show the nearest design when no saturated one exists).
   */
  saturation: 'require' | 'report';
  count: Counts;
  /** Evaluations of the same candidates under another width limit, re-judged rather than repeated (fitsWithin). */
  reuse?: Reuse;
  /** The search only asks whether some design meets every target (fitsWithin): no ridge steps for the objective. */
  meetOnly?: boolean;
}

/** Work done and candidates turned away, for the report. */
export interface Counts {
  /** Combinations the screen covered (rated one by one, or skipped as a group by a bound). */
  screened: number;
  /** Combinations the screen rated one by one. */
  rated: number;
  exact: number;
  /** Rejected: a lower device below VDSsat at mid-span. */
  triode: number;
  /** Rejected: an output device or every length of a bias diode narrower than wmin. */
  narrow: number;
}


/** Build the context; throws input errors for a spec the kit cannot serve, located at `where` (a stage side passes its own). */
export function makeContext(spec: StackSpec, kit: KitAccess, supply: number, corners: string[], where = `stack "${spec.name}"`): SolveContext {
  if (corners.length === 0) throw new StackwrightError('no corner to size on', { where });
  for (const c of corners) {
    if (!kit.corners.includes(c)) throw new StackwrightError(`corner "${c}" is not in kit ${kit.kit} (has ${kit.corners.join(', ')})`, { where });
  }
  if (!(spec.headroom < spec.span)) throw new StackwrightError(`headroom ${formatEng(spec.headroom, 'V', 4)} must be below span ${formatEng(spec.span, 'V', 4)}`, { where: `${where}.headroom` });
  if (spec.span > supply + 1e-12) throw new StackwrightError(`span ${formatEng(spec.span, 'V', 4)} exceeds the supply ${formatEng(supply, 'V', 4)}`, { where: `${where}.span` });
  const coeff = kit.mismatch(spec.device);
  if (coeff && !(coeff.avt >= 0 && coeff.abeta >= 0)) {
    throw new StackwrightError(`kit ${kit.kit} has unusable Pelgrom coefficients for ${spec.device}-type devices (A_VT ${formatEng(coeff.avt, 'V·m')}, A_β ${formatEng(coeff.abeta, 'm')}; SI expected)`, { where });
  }
  if (spec.mismatch !== undefined && !coeff) {
    throw new StackwrightError(`a mismatch target is set but kit ${kit.kit} has no Pelgrom coefficients for ${spec.device}-type devices`, { where: `${where}.mismatch` });
  }
  const lmin = kit.lengths(corners[0], spec.device)[0];
  const wmax = widthLimit(spec, lmin);
  spec = { ...spec, wmax };
  // Per corner, per length (numeric key): no string built per lookup.
  const cache = new Map<string, Map<number, LengthSlice>>();
  const slice = (corner: string, l: number): LengthSlice => {
    let byL = cache.get(corner);
    if (!byL) cache.set(corner, (byL = new Map()));
    let s = byL.get(l);
    if (!s) {
      s = kit.slice(corner, spec.device, l);
      byL.set(l, s);
    }
    return s;
  };
  const nominal = corners[0];
  const uts = new Map<string, number>();
  const ut = (corner: string): number => {
    let u = uts.get(corner);
    if (u === undefined) uts.set(corner, (u = cornerUt(kit, corner, spec.device)));
    return u;
  };
  const vmid = midSpan(spec);
  const lengths = lengthGrid(spec, kit.lengths(nominal, spec.device), where);
  const { values: gmids, step: gmidStep } = gmidGrid(spec, lengths.map((l) => slice(nominal, l)), vmid, where);
  return {
    spec, kit, supply, corners, nominal, vmid,
    ib: spec.biasCurrent ?? spec.current,
    coeff, lengths, gmids, gmidStep, slice, ut,
    wmin: lmin,
    wmax,
    currentLimit: wmax * peakDensity(slice(nominal, lmin)),
    saturation: 'require',
    count: { screened: 0, rated: 0, exact: 0, triode: 0, narrow: 0 },
  };
}
