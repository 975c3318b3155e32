import type { StackSpec } from '../../design/types.js';
import type { Role } from '../../stack/types.js';
import { leastSaturated, widest, type Target } from './checks.js';
import { reportedHeadroom } from '../../policy.js';
import type { StackEval } from './stack-eval.js';

/** What a verdict is about: a spec target (width: the width limit, or the minimum width when nothing was realised), or the table. */
export type VerdictTarget = Target | 'table';

/**
 * Why a design fails (`binding`) or what has the least margin (`tightest`), as
 * data in SI units; sentences are made from it in src/report. Never NaN or
 * Infinity: a value that does not exist is null.
 */
export interface Verdict {
  target: VerdictTarget;
  /** The spec's value: Ω (rout), V (headroom), A (iout), fraction (mismatch σ), V (VDSsat), m (minimum width). */
  required: number | null;
  /** What the design reaches, same unit; null when never reached or not computed. */
  achieved: number | null;
  /** Stack voltage where it was measured, V (rout: the headroom target; iout, mismatch, saturation: mid-span). */
  at: number | null;
  /**
   * The device it concerns (saturation), else null. `top` only for a stacked bias whose every allowed bottom diode
   * leaves the top device no room at mid-span (achieved: the most VDS any leaves it, ≤ 0; required null).
   * A width verdict with no device and `at` set (mid-span) is a stacked bias's with no design at all within the width
   * limit (achieved: the narrowest limit under which one exists).
   */
  device: Role | null;
  /** Corner it was found at. */
  corner: string | null;
}

const LOWER_ROLES: Role[] = ['bottom', 'middle'];

/** A finite number or null (for JSON and reports). */
export function finiteOrNull(x: number | undefined): number | null {
  return x !== undefined && Number.isFinite(x) ? x : null;
}

/** One verdict from its parts, with non-finite values made null. */
export function verdict(target: VerdictTarget, required: number | undefined, achieved: number | undefined, at: number | undefined, corner: string | null, device: Role | null = null): Verdict {
  return { target, required: finiteOrNull(required), achieved: finiteOrNull(achieved), at: finiteOrNull(at), device, corner };
}

/** The verdict on one target of one evaluation (null evaluation: the table does not cover the mid-span bias). */
export function verdictOf(target: Target, spec: StackSpec, ev: StackEval | null, sigma: number | undefined, vmid: number, corner: string | null): Verdict {
  if (!ev) return verdict('table', undefined, undefined, vmid, corner);
  switch (target) {
    case 'rout':
      return verdict('rout', spec.rout, ev.routAtTarget, spec.headroom, corner);
    case 'headroom':
      return verdict('headroom', spec.headroom, reportedHeadroom(ev.headroom), undefined, corner);
    case 'iout':
      return verdict('iout', spec.current, ev.iout, vmid, corner);
    case 'mismatch':
      return verdict('mismatch', spec.mismatch, sigma, vmid, corner);
    case 'width': {
      const { k, w } = widest(ev);
      const roles = ev.devices.length === 1 ? ['bottom'] : ev.devices.length === 2 ? ['bottom', 'top'] : ['bottom', 'middle', 'top'];
      return verdict('width', spec.wmax, w, undefined, corner, roles[k] as Role);
    }
    case 'saturation': {
      const k = leastSaturated(ev);
      if (k < 0) return verdict('saturation', undefined, undefined, vmid, corner);
      return verdict('saturation', ev.vdsat[k], ev.mid.devices[k].vds, vmid, corner, LOWER_ROLES[k]);
    }
  }
}
