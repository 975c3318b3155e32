import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { sizeStack, sizeStage, type Kit } from '../src/index.js';
import type { StackSpec, StageSpec, Topology } from '../src/design/types.js';
import { demoKit, ensureDemoTables, REPO } from './helpers/cli.js';
import { exhaustive } from './helpers/exhaustive.js';

/**
 * Open misses of the random audit of 2026-12-05 against the exhaustive references (tests/helpers/exhaustive.ts,
 * tests/helpers/stage-exhaustive.ts): specs drawn near the edge of feasibility on the three demo kits, where the
 * reference found a better design than the search does, beyond the tolerances of tests/optimal.test.ts and
 * tests/stage-optimal.test.ts (area and Rout 5 %, headroom 5 mV, nearest points 5 %). They are known defects (issue
 * 9), so they run only on demand: `STACKWRIGHT_AUDIT=1 npx vitest run tests/audit-open.test.ts`. A case that is fixed
 * moves into those tests (with the exhaustive search itself) and out of tests/fixtures/audit-open.json.
 *
 * Stacks: the reference's better design is judged here by the reference's own code (`only`), so the check needs no
 * grid search. Stages: the area the reference search found on the case's grid, recorded by the audit.
 */

interface StackCase {
  /** The audit's case label: a number (audit2) or 'A3-n' (audit3). */
  case: number | string;
  id: string;
  kit: string;
  /**
   * What the search misses: an objective, a feasible spec called infeasible, the nearest Rout at the headroom target,
   * the nearest headroom at the Rout target (`design` the reference's), or a nearest headroom the reference finds no
   * design for (`nearHclaim`: `design` the tool's, which the reference judges).
   */
  kind: 'area' | 'headroom' | 'rout' | 'infeasible' | 'nearR' | 'nearH' | 'nearHclaim';
  spec: Omit<StackSpec, 'name' | 'topology'> & { topology: Topology };
  design: { l: number[]; gmid: number[]; setpoints: number[] };
}
interface StageCase {
  case: string;
  id: string;
  kit: string;
  stage: Omit<StageSpec, 'name'>;
  /** Absent: the area. Else which nearest point the search misses (tests/stage-nearest.test.ts's checks and tolerances). */
  kind?: 'nearPeak' | 'nearSwing' | 'nearHeld';
  /**
   * The reference search's area on its grid (gm/ID points per device, setpoint step), m²; for a nearest miss its
   * nearest points instead: gain at the design point, gain held over the swing target, swing at the gain target (V).
   */
  reference: { area?: number; grid: { gmidPoints: number; vStep: number }; peak?: number; held?: number; swing?: number };
}

const open = JSON.parse(readFileSync(join(REPO, 'tests', 'fixtures', 'audit-open.json'), 'utf8')) as { stacks: StackCase[]; stages: StageCase[] };
const SUPPLY: Record<string, number> = { demo180: 1.8, demo090: 1.2, reed180: 1.8 };
const kits: Record<string, Kit> = {};

// With none open the suite is skipped (vitest fails a suite without tests).
const anyOpen = open.stacks.length + open.stages.length > 0;

describe.runIf(process.env.STACKWRIGHT_AUDIT && anyOpen)('open audit misses (on demand: STACKWRIGHT_AUDIT=1)', () => {
  beforeAll(() => {
    ensureDemoTables();
    for (const k of Object.keys(SUPPLY)) kits[k] = demoKit(k);
  });

  for (const c of open.stacks) {
    it(`#${c.case} ${c.id} (${c.kind})`, () => {
      const spec: StackSpec = { name: c.id, ...c.spec };
      const tool = sizeStack(spec, kits[c.kit], { supply: SUPPLY[c.kit], corners: ['tt'] }).results[0];
      const judged = exhaustive(spec, kits[c.kit], c.spec.topology, 'tt', { gmidStep: 1, vStep: 1, nearest: true, only: [c.design] });
      if (c.kind === 'nearR') {
        expect(tool.feasible).toBe(false);
        expect(tool.nearest?.routAtHeadroom ?? 0).toBeGreaterThanOrEqual(0.95 * judged.routAtHeadroom);
        return;
      }
      // Infinity: the tool finds no design meeting the Rout target up to the span.
      const h = tool.nearest?.headroomAtRout ?? Infinity;
      if (c.kind === 'nearH') {
        expect(tool.feasible).toBe(false);
        expect(h).toBeLessThanOrEqual(judged.headroomAtRout + 0.01);
        return;
      }
      if (c.kind === 'nearHclaim') {
        expect(tool.feasible).toBe(false);
        expect(judged.headroomAtRout).toBeLessThanOrEqual(h + 0.01);
        return;
      }
      const ref = judged.best;
      expect(ref, 'the reference accepts the design').toBeDefined();
      expect(tool.feasible).toBe(true);
      if (c.kind === 'area') expect(tool.predicted.area).toBeLessThanOrEqual(1.05 * ref!.area);
      if (c.kind === 'headroom') expect(tool.predicted.headroom).toBeLessThanOrEqual(ref!.headroom + 0.005);
      if (c.kind === 'rout') expect(tool.predicted.rout).toBeGreaterThanOrEqual(0.95 * ref!.rout);
    });
  }

  for (const c of open.stages) {
    it(`${c.case} ${c.id}`, () => {
      const stage: StageSpec = { name: c.case, ...c.stage };
      const tool = sizeStage(stage, kits[c.kit], { supply: SUPPLY[c.kit], corners: ['tt'] }).results[0];
      const r = c.reference;
      if (c.kind) {
        expect(tool.feasible).toBe(false);
        const near = tool.nearest!;
        const b = tool.binding;
        if (c.kind === 'nearPeak' && r.peak! < stage.gain) expect(b?.target === 'gain' && b.at === stage.output ? b.achieved ?? 0 : 0).toBeGreaterThanOrEqual(0.95 * r.peak!);
        if (c.kind === 'nearPeak' && r.peak! >= stage.gain) expect(b?.at).toBeNull();
        if (c.kind === 'nearSwing' && r.peak! < stage.gain) expect(near.swingAtGain).toBe(0);
        if (c.kind === 'nearSwing' && r.peak! >= stage.gain) {
          expect(near.swingAtGain).toBeGreaterThanOrEqual(r.swing! - 0.01);
          expect(near.swingAtGain).toBeLessThanOrEqual(r.swing! + 0.03);
        }
        if (c.kind === 'nearHeld') {
          expect(near.gainAtSwing).toBeGreaterThanOrEqual(0.95 * r.held!);
          expect(near.gainAtSwing).toBeLessThanOrEqual(1.1 * r.held!);
        }
        return;
      }
      expect(tool.feasible).toBe(true);
      expect(tool.predicted.area).toBeLessThanOrEqual(1.05 * r.area!);
    });
  }
});
