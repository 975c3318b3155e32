import { beforeAll, describe, expect, it } from 'vitest';
import { type Kit } from '../src/index.js';
import type { StackSpec } from '../src/design/types.js';
import { makeContext } from '../src/solve/context.js';
import { screen } from '../src/solve/search/screen.js';
import { neighbours } from '../src/solve/search/refine.js';
import { lookAt, routSurelyBelow, routSurelyBelowAt, scanPointAtOrAbove, shortfallSurelyAbove } from '../src/solve/search/quick.js';
import { evaluateCandidate } from '../src/solve/evaluate/evaluate.js';
import type { Candidate } from '../src/solve/search/candidate.js';
import { CandidateMap } from '../src/solve/search/candidate-map.js';
import { distanceToFeasible } from '../src/policy.js';
import { demoKit, ensureDemoTables } from './helpers/cli.js';

// The quick look spares exact evaluations only through bounds, so each bound must hold against the exact evaluation
// of the same candidate (common practice: a pruning bound of branch and bound never exceeds what it bounds, or the
// pruned search answers differently). Headroom is the lowest voltage from which Rout and the current window hold up
// to span (README definition); Rout at a point of [target headroom, span] bounds the lowest Rout there from above.

let kit: Kit;
beforeAll(() => {
  ensureDemoTables();
  kit = demoKit('demo180');
});

// The demo's p-type load source as a stacked cascode: infeasible, so the nearest-point climbs use every bound.
const spec: StackSpec = {
  name: 'load', device: 'p', topology: 'cascode-stacked', current: 10e-6, rout: 100e6, headroom: 0.5, span: 1.5, objective: 'area',
};

/** Screen proposals (at the target headroom and lifted towards mid-span) and their one-step neighbours. */
function candidates(): Candidate[] {
  const ctx = makeContext(spec, kit, 1.8, ['tt']);
  const lifted = { ...ctx, spec: { ...ctx.spec, headroom: ctx.vmid - 0.05, objective: 'headroom' as const } };
  const seeds = [...screen(ctx, 'cascode-stacked'), ...screen(lifted, 'cascode-stacked')];
  const out = new CandidateMap<Candidate>();
  for (const c of seeds) {
    out.set(out.key(c), c);
    for (const n of neighbours(ctx, c, ctx.gmidStep / 2, 0.05, false)) out.set(out.key(n), n);
  }
  return [...out.values()];
}

describe('quick-look bounds against the exact evaluation (demo180, p-type stacked cascode)', () => {
  it('fixed margins equal, Rout, headroom and shortfall bounds never exceed the exact figures', () => {
    const ctx = makeContext(spec, kit, 1.8, ['tt']);
    const fired = { rout: 0, headroom: 0, shortfall: 0 };
    let compared = 0;
    for (const c of candidates()) {
      const l = lookAt(ctx, c);
      const e = evaluateCandidate(ctx, c);
      if (!l || !e) continue;
      compared++;
      expect(l.fixed.iout).toBe(e.margins.iout);
      expect(l.fixed.width).toBe(e.margins.width);
      expect(l.fixed.saturation).toBe(e.margins.saturation);
      if (routSurelyBelow(l, spec.rout)) {
        fired.rout++;
        expect(e.nominal.routAtTarget).toBeLessThan(spec.rout);
      }
      for (let v = spec.headroom; v < spec.span; v += 0.07) {
        const at = scanPointAtOrAbove(spec.span, v);
        expect(at).toBeGreaterThanOrEqual(v);
        if (routSurelyBelowAt(l, at, spec.rout)) {
          fired.headroom++;
          expect(e.nominal.headroom).toBeGreaterThan(at);
        }
      }
      const exact = distanceToFeasible(e.margins);
      for (const x of [0.01, 0.3, 1, 3, 6, 10]) {
        if (shortfallSurelyAbove(ctx, l, x)) {
          fired.shortfall++;
          expect(exact).toBeGreaterThan(x);
        }
      }
    }
    // The bounds were put to the test, not skipped.
    expect(compared).toBeGreaterThan(100);
    expect(fired.rout).toBeGreaterThan(10);
    expect(fired.headroom).toBeGreaterThan(10);
    expect(fired.shortfall).toBeGreaterThan(10);
  });
});
