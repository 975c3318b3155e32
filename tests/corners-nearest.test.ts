import { beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { loadKit, parseSpec, sizeStack, type Kit } from '../src/index.js';
import type { StackSpec } from '../src/design/types.js';
import type { StackResult } from '../src/solve/types.js';
import { makeContext, type SolveContext } from '../src/solve/context.js';
import { ensureCorners, evaluateCandidate, type Evaluated } from '../src/solve/evaluate/evaluate.js';
import { statusLine } from '../src/report/rows.js';
import { REPO, demoKits } from './helpers/cli.js';

/*
 * Nearest points over every corner (README, "JSON output of size --json": nearest.overCorners): the lowest headroom at
 * which the Rout target holds at every corner at once, and the highest Rout at the headroom target that every corner
 * keeps, each design sized at the nominal corner and judged at its worst corner. Checked against a plain grid search
 * over the whole allowed space (every allowed length of each device, gm/ID over the spec's range, the VDS setpoint),
 * refined on a finer grid around its winners. The reference shares the tool's evaluation of one design (src/solve/
 * evaluate: sizing, and each corner re-biased through the design's own bias diodes), none of its search; it skips a
 * design only on exact necessary conditions (a design's worst-corner headroom is at least its nominal one and its
 * worst-corner Rout at most its nominal one).
 */

interface Reference {
  headroomAtRout: number;
  routAtHeadroom: number;
  winners: Evaluated['cand'][];
}

const range = (a: number, b: number, step: number): number[] => {
  const out: number[] = [];
  for (let x = a; x <= b + 1e-9; x += step) out.push(Number(x.toFixed(6)));
  return out;
};

function worst(ctx: SolveContext, e: Evaluated): { usable: boolean; headroom: number; rout: number } {
  let usable = e.margins.mismatch >= 0 && e.margins.iout >= 0 && e.margins.saturation >= 0 && e.margins.width >= 0;
  let headroom = e.nominal.headroom;
  let rout = e.nominal.routAtTarget;
  for (const c of ensureCorners(ctx, e, true)) {
    if (!c.ev || c.margins.iout < 0 || c.margins.saturation < 0) usable = false;
    headroom = Math.max(headroom, c.ev ? c.ev.headroom : Infinity);
    rout = Math.min(rout, c.ev ? c.ev.routAtTarget : 0);
  }
  return { usable, headroom, rout };
}

/**
 * One design of a grid into the reference: usable at the nominal corner and, judged at its worst corner, lower in
 * headroom or higher in Rout than the best so far. Designs beaten on both at the nominal corner (a worst corner is no
 * better) are not judged at the others.
 */
function consider(ctx: SolveContext, e: Evaluated | null, into: Reference): void {
  if (!e || !(e.margins.mismatch >= 0 && e.margins.iout >= 0 && e.margins.saturation >= 0 && e.margins.width >= 0)) return;
  if (e.nominal.headroom >= into.headroomAtRout && e.nominal.routAtTarget <= into.routAtHeadroom) return;
  const w = worst(ctx, e);
  if (!w.usable) return;
  if (w.headroom < into.headroomAtRout) {
    into.headroomAtRout = w.headroom;
    into.winners[0] = e.cand;
  }
  if (w.rout > into.routAtHeadroom) {
    into.routAtHeadroom = w.rout;
    into.winners[1] = e.cand;
  }
}

function gridSearch(ctx: SolveContext, ls: number[][], gs: number[][], ss: number[], into: Reference): void {
  const topology = ctx.spec.topology as 'cascode' | 'cascode-stacked';
  for (const l1 of ls[0]) for (const l2 of ls[1]) for (const g1 of gs[0]) for (const g2 of gs[1]) for (const s1 of ss) {
    consider(ctx, evaluateCandidate(ctx, { topology, l: [l1, l2], gmid: [g1, g2], setpoints: topology === 'cascode' ? [s1] : [] }), into);
  }
}

/**
 * Grid reference for a cascode or stacked cascode (no setpoint: its bottom diode sets the node) over `corners`
 * (nominal first): a coarse grid, then a 4× finer one around each winner.
 */
function reference(spec: StackSpec, kit: Kit, supply: number, corners: string[]): Reference {
  const ctx = makeContext(spec, kit, supply, corners);
  // The allowed gm/ID range: the spec's, else what the tables reach (the README's definition, as the tool reads it).
  const [g0, g1] = [ctx.gmids[0], ctx.gmids[ctx.gmids.length - 1]];
  const gs = (g1 - g0) / 8;
  const ref: Reference = { headroomAtRout: Infinity, routAtHeadroom: 0, winners: [] };
  const setpoints = spec.topology === 'cascode' ? range(0.05, 0.6, 0.05) : [0];
  gridSearch(ctx, [ctx.lengths, ctx.lengths], [range(g0, g1, gs), range(g0, g1, gs)], setpoints, ref);
  for (const c of [...ref.winners]) {
    const near = (x: number, step: number, lo: number, hi: number) => range(Math.max(lo, x - 4 * step), Math.min(hi, x + 4 * step), step);
    const lengthsNear = (l: number) => ctx.lengths.filter((x) => Math.abs(Math.log(x / l)) < 0.45);
    gridSearch(
      ctx, [lengthsNear(c.l[0]), lengthsNear(c.l[1])], [near(c.gmid[0], gs / 4, g0, g1), near(c.gmid[1], gs / 4, g0, g1)],
      spec.topology === 'cascode' ? near(c.setpoints[0], 0.0125, 0.02, 0.8) : [0], ref,
    );
  }
  return ref;
}

/**
 * Grid reference for a triple over `corners`, kept affordable by the spec's narrow length range: every allowed length
 * of each device, gm/ID on 5 levels over the allowed range, both VDS setpoints from 0.05 to 0.6 V by 0.05 V (144,000
 * designs at two lengths), then gm/ID by a quarter of that step and the setpoints by 12.5 mV around each winner.
 */
function tripleReference(spec: StackSpec, kit: Kit, supply: number, corners: string[]): Reference {
  const ctx = makeContext(spec, kit, supply, corners);
  const [g0, g1] = [ctx.gmids[0], ctx.gmids[ctx.gmids.length - 1]];
  const gs = (g1 - g0) / 4;
  const ref: Reference = { headroomAtRout: Infinity, routAtHeadroom: 0, winners: [] };
  const search = (ls: number[][], gms: number[][], sps: number[][]): void => {
    for (const l1 of ls[0]) for (const l2 of ls[1]) for (const l3 of ls[2]) for (const g1_ of gms[0]) for (const g2 of gms[1]) for (const g3 of gms[2]) {
      for (const s1 of sps[0]) for (const s2 of sps[1]) {
        consider(ctx, evaluateCandidate(ctx, { topology: 'triple', l: [l1, l2, l3], gmid: [g1_, g2, g3], setpoints: [s1, s2] }), ref);
      }
    }
  };
  const sp = range(0.05, 0.6, 0.05);
  search([ctx.lengths, ctx.lengths, ctx.lengths], [range(g0, g1, gs), range(g0, g1, gs), range(g0, g1, gs)], [sp, sp]);
  const near = (x: number, step: number, lo: number, hi: number) => range(Math.max(lo, x - 2 * step), Math.min(hi, x + 2 * step), step);
  for (const c of [...ref.winners]) {
    search(c.l.map((l) => [l]), c.gmid.map((g) => near(g, gs / 4, g0, g1)), c.setpoints.map((x) => near(x, 0.0125, 0.02, 0.8)));
  }
  return ref;
}

const cases: Array<{ what: string; kit: 'demo180' | 'demo090' | 'reed180'; supply: number; corners: string[]; stack: string; oneSided?: boolean }> = [
  {
    what: 'n cascode on demo180 (tt, ff, ss): about its headroom target at tt alone, much more at ss',
    kit: 'demo180', supply: 1.8, corners: ['tt', 'ff', 'ss'],
    stack: '{name: tail, device: n, topology: cascode, current: 20u, rout: 200meg, headroom: 0.35, span: 1.6, l: [0.5u, 2u], gmid: {min: 5, max: 25}}',
  },
  {
    what: 'p cascode on demo090 (tt, ff, ss)',
    kit: 'demo090', supply: 1.2, corners: ['tt', 'ff', 'ss'],
    stack: '{name: src, device: p, topology: cascode, current: 10u, rout: 100meg, headroom: 0.3, span: 1.0, l: [0.3u, 1.2u], gmid: {min: 6, max: 24}}',
  },
  {
    // The demo ota-load as a stacked cascode: its best Rout at the headroom target lies on the width limit's edge.
    what: 'p stacked cascode on demo180 (tt, ff, ss): nearest Rout on the edge of the width limit',
    kit: 'demo180', supply: 1.8, corners: ['tt', 'ff', 'ss'],
    stack: '{name: ld, device: p, topology: cascode-stacked, current: 10u, rout: 300meg, headroom: 0.5, span: 1.5}',
  },
  {
    what: 'n triple on demo180 (tt, ss), two adjacent lengths',
    kit: 'demo180', supply: 1.8, corners: ['tt', 'ss'],
    stack: '{name: deep, device: n, topology: triple, current: 20u, rout: 5g, headroom: 0.5, span: 1.6, l: [0.5u, 0.7u], gmid: {min: 6, max: 22}}',
  },
  {
    // The tool climbs on a continuum and beats this grid's Rout by about a fifth (setpoints between its steps).
    what: 'p triple on demo090 (tt, ff, ss), two adjacent lengths',
    kit: 'demo090', supply: 1.2, corners: ['tt', 'ff', 'ss'], oneSided: true,
    stack: '{name: deep, device: p, topology: triple, current: 5u, rout: 2g, headroom: 0.4, span: 1.0, l: [0.3u, 0.5u], gmid: {min: 6, max: 22}}',
  },
  {
    // At ss the bias diodes track the output devices only to within 1–2 % (tests/corners-port.test.ts), so the
    // designs best at tt all lose the 1 % current window there: the answer lies elsewhere in the space (first found
    // by this reference when the climbs started only from the nominal leaders and said no design was usable). The
    // tool climbs on a continuum and can beat this grid, so only "no worse than the grid" is asked here.
    what: 'p cascode on reed180 (tt, ss): the nominal corner\'s best designs miss the current window at ss',
    kit: 'reed180', supply: 1.8, corners: ['tt', 'ss'], oneSided: true,
    stack: '{name: excitation, device: p, topology: cascode, current: 200u, rout: 1meg, headroom: 0.3, span: 1.5}',
  },
];

describe('nearest points over every corner, against a grid search over the allowed space', () => {
  let kits: Record<'demo180' | 'demo090' | 'reed180', Kit>;
  beforeAll(() => {
    const demo = demoKits().kits;
    kits = { ...demo, reed180: loadKit('reed180', { tables: join(REPO, 'tables') }) };
  });

  for (const c of cases) {
    it(c.what, () => {
      const kit = kits[c.kit];
      const spec = parseSpec(`kit: ${c.kit}\nsupply: ${c.supply}\nstacks:\n  - ${c.stack}\n`, 'corners.yaml').stacks[0];
      const corners = c.corners;
      const r = sizeStack(spec, kit, { supply: c.supply, corners }).results[0];
      expect(r.feasible).toBe(false);
      const all = r.nearest?.overCorners;
      expect(all).toBeDefined();
      const ref = (spec.topology === 'triple' ? tripleReference : reference)(spec, kit, c.supply, corners);
      expect(Number.isFinite(ref.headroomAtRout) && ref.routAtHeadroom > 0).toBe(true);
      // The tolerances for nearest points: 10 mV and 5 %.
      expect(all!.headroomAtRout - ref.headroomAtRout).toBeLessThanOrEqual(0.010);
      expect(all!.routAtHeadroom / ref.routAtHeadroom).toBeGreaterThanOrEqual(0.95);
      if (!c.oneSided) {
        expect(ref.headroomAtRout - all!.headroomAtRout).toBeLessThanOrEqual(0.010);
        expect(all!.routAtHeadroom / ref.routAtHeadroom).toBeLessThanOrEqual(1.05);
      }
      // Every corner at once is never easier than the nominal corner alone.
      expect(all!.headroomAtRout).toBeGreaterThanOrEqual(r.nearest!.headroomAtRout!);
      expect(all!.routAtHeadroom).toBeLessThanOrEqual(r.nearest!.routAtHeadroom!);
      // The sentence carries the same figure, rounded up to the mV like every reported headroom.
      expect(statusLine(r)).toContain(`at every corner at once, the Rout target needs ${all!.headroomAtRout.toFixed(3)} V of headroom at best`);
    }, 120_000);
  }

  it('the text says when no allowed design keeps its current window at every corner, rather than blaming Rout', () => {
    const stack = {
      name: 's', feasible: false, corners: [{ corner: 'tt' }, { corner: 'ss' }],
      nearest: { headroomAtRout: 0.4, routAtHeadroom: 2e8, corner: 'tt', overCorners: { headroomAtRout: Infinity, routAtHeadroom: 0 } },
    } as unknown as StackResult;
    expect(statusLine(stack)).toContain('at every corner at once, no allowed design keeps its current within the window with its devices saturated');
    const reached = { ...stack, nearest: { ...stack.nearest, overCorners: { headroomAtRout: Infinity, routAtHeadroom: 5e7 } } } as StackResult;
    expect(statusLine(reached)).toContain('at every corner at once, the Rout target is reached by no allowed design up to the span and Rout at the headroom target reaches 50 MΩ');
  });

  it('a run on one corner has no over-corners figures', () => {
    const spec = parseSpec(`kit: demo180\nsupply: 1.8\nstacks:\n  - ${cases[0].stack}\n`, 'one.yaml').stacks[0];
    const r = sizeStack(spec, kits.demo180, { supply: 1.8, corners: ['tt'] }).results[0];
    expect(r.feasible).toBe(false);
    expect(r.nearest?.overCorners).toBeUndefined();
  });
});
