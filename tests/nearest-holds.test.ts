import { beforeAll, describe, expect, it, vi } from 'vitest';
import { sizeStack, type Kit } from '../src/index.js';
import type { StackSpec } from '../src/design/types.js';
import { captured } from './helpers/nearest-capture.js';
import type { Evaluated } from '../src/solve/evaluate/evaluate.js';
import { sampleAt, type StackOp } from '../src/stack/index.js';
import { demoKit, ensureDemoTables } from './helpers/cli.js';
import { exhaustive } from './helpers/exhaustive.js';

// The nearest points of an infeasible spec name designs; these cases are ones where the tool's figure beats the
// exhaustive reference (tests/helpers/exhaustive.ts) on its usual grid (gm/ID 3 /V, setpoints 50 mV) by more than
// 10 mV or 5 %: every such design found sits on the width limit at a setpoint between that grid's points. Each is
// checked against the reference, not the tool: the design behind the figure, judged by the reference's own code,
// has it; the same on a 1 mV grid from span down (README definitions: Rout ≥ target, current within 1 %); and the
// reference, on a grid fine enough near that design, reaches the figure within 10 mV / 5 %.

// The designs behind the reported figures, as the search hands them to the report.
vi.mock('../src/solve/nearest.js', async (importOriginal) => (await import('./helpers/nearest-capture.js')).capturing(await importOriginal()));
const seen = captured;

interface Case {
  id: string;
  spec: Omit<StackSpec, 'name'>;
  /** Which nearest figure beat the usual grid: lowest headroom at the Rout target, or highest Rout at the headroom target. */
  question: 'headroom' | 'rout';
  /** gm/ID window of the finer reference grid (inside the allowed range), 1/V. */
  gmid: [number, number];
}

// reed180 (supply 1.8 V), cascode; found by random audits. In brackets: tool's figure, the usual grid's.
const CASES: Case[] = [
  { // 0.695 V against 0.717 V
    id: 'n-headroom', question: 'headroom', gmid: [3, 5.5],
    spec: { device: 'n', topology: 'cascode', current: 646e-6, rout: 16.3e3, headroom: 0.434, span: 1.151, objective: 'rout', wmax: 8.7e-6 },
  },
  { // 1.80 MΩ against 1.09 MΩ
    id: 'n-rout', question: 'rout', gmid: [22.5, 25.5],
    spec: { device: 'n', topology: 'cascode', current: 3.43e-6, rout: 44.1e6, headroom: 0.181, span: 1.322, objective: 'rout', wmax: 6.6e-6 },
  },
  { // 0.459 V against 0.480 V
    id: 'p-headroom', question: 'headroom', gmid: [6, 9],
    spec: { device: 'p', topology: 'cascode', current: 65.8e-6, rout: 24.5e3, headroom: 0.381, span: 1.224, objective: 'headroom', wmax: 6.9e-6 },
  },
  { // 0.592 V against 0.609 V
    id: 'p-headroom-2', question: 'headroom', gmid: [5.5, 10],
    spec: { device: 'p', topology: 'cascode', current: 82e-6, rout: 734e3, headroom: 0.443, span: 1.356, objective: 'headroom', wmax: 11e-6 },
  },
  { // 428 kΩ against 343 kΩ
    id: 'p-rout', question: 'rout', gmid: [13, 15.5],
    spec: { device: 'p', topology: 'cascode', current: 11.5e-6, rout: 5.28e6, headroom: 0.268, span: 1.581, objective: 'headroom', wmax: 5.2e-6 },
  },
  { // 6.61 MΩ against 5.46 MΩ
    id: 'p-rout-2', question: 'rout', gmid: [18, 22],
    spec: { device: 'p', topology: 'cascode', current: 3.92e-6, rout: 20.1e6, headroom: 0.25, span: 0.734, objective: 'area', wmax: 14e-6 },
  },
];

const STEP = 1e-3;

/**
 * From span down on a 1 mV grid (README definitions, judged with the stack layer only): the lowest grid point
 * above which Rout ≥ target and the current is within 1 % of the design current everywhere, and the lowest Rout
 * over [headroom target, span].
 */
function fineGrid(e: Evaluated, spec: StackSpec, kit: Kit): { headroom: number; routAtTarget: number } {
  const devices = e.cand.l.map((l, k) => ({ slice: kit.slice('tt', spec.device, l), w: e.sized.w[k] }));
  const gates = [...e.sized.gates];
  const n = Math.round(spec.span / STEP);
  let guess: StackOp | undefined;
  let headroom = Infinity;
  let held = true;
  let rout = Infinity;
  for (let j = n; j >= 0; j--) {
    const v = (spec.span * j) / n;
    if (!held && v < spec.headroom) break;
    const s = sampleAt(devices, gates, v, guess);
    if (s.op) guess = s.op;
    held &&= s.op !== null && s.rout >= spec.rout && Math.abs(s.i - spec.current) <= 0.01 * spec.current;
    if (held) headroom = v;
    if (v >= spec.headroom) rout = Math.min(rout, s.op ? s.rout : 0);
  }
  const at = sampleAt(devices, gates, spec.headroom, guess);
  return { headroom, routAtTarget: Math.min(rout, at.op ? at.rout : 0) };
}

let kit: Kit;
beforeAll(() => {
  ensureDemoTables();
  kit = demoKit('reed180');
});

describe('nearest points beyond the usual reference grid name designs that hold (exhaustive reference search)', () => {
  for (const c of CASES) {
    it(`${c.id}: ${c.question === 'headroom' ? 'lowest headroom at the Rout target' : 'highest Rout at the headroom target'}`, () => {
      const spec: StackSpec = { name: c.id, ...c.spec };
      seen.length = 0;
      const tool = sizeStack(spec, kit, { supply: 1.8, corners: ['tt'] }).results[0];
      expect(tool.feasible).toBe(false);
      const near = seen.at(-1)!;
      const e = c.question === 'headroom' ? near.atRout : near.atHeadroom;
      expect(e).toBeDefined();
      const design = { l: [...e!.cand.l], gmid: [...e!.cand.gmid], setpoints: [...e!.cand.setpoints] };
      // The reference sizes and judges that design itself (gmidStep/vStep unused when judging given designs).
      const judged = exhaustive(spec, kit, 'cascode', 'tt', { gmidStep: 1, vStep: 1, only: [design] });
      expect(judged.designs).toBe(1);
      expect(Math.max(...e!.sized.w)).toBeLessThanOrEqual(spec.wmax!);
      const fine = fineGrid(e!, spec, kit);
      const ref = exhaustive(spec, kit, 'cascode', 'tt', { gmidStep: 0.5, vStep: 0.01, gmid: c.gmid });
      if (c.question === 'headroom') {
        const h = tool.nearest!.headroomAtRout!;
        // The reference bisects to 1 mV; the report rounds up to the mV.
        expect(judged.headroomAtRout).toBeLessThanOrEqual(h + 1e-3);
        expect(fine.headroom).toBeLessThanOrEqual(h + 1e-9);
        expect(Math.abs(ref.headroomAtRout - h)).toBeLessThanOrEqual(0.01);
      } else {
        const r = tool.nearest!.routAtHeadroom!;
        expect(judged.routAtHeadroom).toBeGreaterThanOrEqual(r * (1 - 1e-6));
        expect(fine.routAtTarget).toBeGreaterThanOrEqual(r * (1 - 1e-3));
        expect(Math.abs(ref.routAtHeadroom / r - 1)).toBeLessThanOrEqual(0.05);
      }
    });
  }
});
