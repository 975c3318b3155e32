/**
 * The sizing policy in one place: what "meets the targets" means, how designs
 * are ordered, and the tolerances every layer shares (the search, the stack
 * layer's headroom, the ngspice measurement). Pure; imports nothing.
 */

/** Allowed deviation of the output current from its mid-span value, relative (1 %, common practice for a current source's compliance). */
export const CURRENT_WINDOW = 0.01;

/** Stack voltage where the design bias is set and the current is referenced: midway between headroom target and span, V. */
export function midSpan(t: { headroom: number; span: number }): number {
  return 0.5 * (t.headroom + t.span);
}

/**
 * Slack on table edges, as a share of the axis span: grids are built from decimal
 * text, so rounding there is not "outside". Applied by numeric/axis.ts `edgeTolerance`.
 */
export const TABLE_EDGE = 1e-9;

/** Relative tolerance for comparing lengths, widths and areas built by arithmetic. */
export const REL_TOL = 1e-9;

/** Volt margins are counted per 50 mV, so one unit weighs like a factor e of Rout. */
export const VOLT_SCALE = 0.05;

/** What to optimise among designs that meet every target. */
export type Objective = 'area' | 'headroom' | 'rout';

/** The measures designs are ordered by: ΣW·L (m²), provided headroom (V), Rout (Ω). */
export interface Measures {
  area: number;
  headroom: number;
  rout: number;
}

// Ties: headroom within 1 mV, Rout within 1 %, area within REL_TOL, are settled by the next measure.
const mv = (h: number) => (Number.isFinite(h) ? Math.round(h * 1000) : Infinity);
const pct = (r: number) => (r > 0 ? Math.floor(Math.log(r) / Math.log(1.01)) : -Infinity);

/** Objective order between two designs that both meet the targets (< 0: a is better). */
export function objectiveCompare(objective: Objective, a: Measures, b: Measures): number {
  const d = {
    area: a.area - b.area,
    headroom: mv(a.headroom) - mv(b.headroom),
    rout: pct(b.rout) - pct(a.rout),
  };
  const order: Array<keyof typeof d> =
    objective === 'area' ? ['area', 'headroom', 'rout'] : objective === 'headroom' ? ['headroom', 'area', 'rout'] : ['rout', 'area', 'headroom'];
  for (const k of order) {
    const x = d[k];
    if (k === 'area' ? Math.abs(x) > REL_TOL * Math.max(a.area, b.area) : x !== 0 && !Number.isNaN(x)) return x;
  }
  return 0;
}

/** Margin of each target (≥ 0 met, < 0 missed), normalised so they compare and add. */
export interface Margins {
  /** ln(Rout / target). */
  rout: number;
  /** (target − headroom) / 50 mV. */
  headroom: number;
  /** 1 − |I − target| / (1 % of target). */
  iout: number;
  /** 1 − σ / target. */
  mismatch: number;
  /** Lowest (VDS − VDSsat) / 50 mV at mid-span below the top device (Infinity for one device). */
  saturation: number;
  /** ln(width limit / widest output device): ≥ 0 when every device fits (Infinity without a limit). */
  width: number;
}

export interface Targets {
  rout: number;
  headroom: number;
  current: number;
  mismatch?: number;
  /** Widest allowed output device, m. */
  wmax?: number;
}

/** What a design reaches: Rout at the headroom target (Ω), headroom (V), mid-span current (A), σ, saturation margin. */
export interface Reached {
  rout: number;
  headroom: number;
  iout: number;
  sigma?: number;
  saturation: number;
  /** Widest output device, m. */
  width?: number;
}

/** Margins of what a design reaches against the targets. */
export function marginsFor(t: Targets, r: Reached): Margins {
  return {
    rout: r.rout > 0 ? Math.log(r.rout / t.rout) : -Infinity,
    headroom: Number.isFinite(r.headroom) ? (t.headroom - r.headroom) / VOLT_SCALE : -Infinity,
    iout: currentMargin(r.iout, t.current),
    mismatch: t.mismatch === undefined || r.sigma === undefined ? Infinity : 1 - r.sigma / t.mismatch,
    saturation: r.saturation,
    width: t.wmax === undefined || r.width === undefined ? Infinity : Math.log(t.wmax / r.width),
  };
}

/**
 * A provided headroom as reported everywhere (results, words, JSON): rounded up to the whole mV, so a
 * reported value never reads as meeting a target the design misses (the margins use the raw value).
 */
export function reportedHeadroom(h: number): number {
  return Number.isFinite(h) ? Math.ceil(h * 1000 - 1e-6) / 1000 : h;
}

/** 1 − |i − reference| / (window · |reference|): ≥ 0 inside the current window. */
export function currentMargin(i: number, reference: number): number {
  return 1 - Math.abs(i - reference) / (CURRENT_WINDOW * Math.abs(reference));
}

export function meetsAll(m: Margins): boolean {
  return m.rout >= 0 && m.headroom >= 0 && m.iout >= 0 && m.mismatch >= 0 && m.saturation >= 0 && m.width >= 0;
}

/** Distance to feasible: the sum of shortfalls, 0 when every target is met. Infinite shortfalls are capped so designs still rank. */
export function distanceToFeasible(m: Margins): number {
  const cap = (x: number) => Math.min(Math.max(0, -x), 50);
  return cap(m.rout) + cap(m.headroom) + cap(m.iout) + cap(m.mismatch) + cap(m.saturation) + cap(m.width);
}
