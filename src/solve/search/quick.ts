import { sampleAt, sizeStackDevices, type StackDevice } from '../../stack/index.js';
import { topologyOf } from '../../topology/index.js';
import { currentMargin } from '../../policy.js';
import type { SolveContext } from '../context.js';
import { saturationMargin } from '../evaluate/checks.js';
import { pelgromSigma } from '../evaluate/mismatch.js';
import { rangeSafe } from '../evaluate/evaluate.js';
import { midPoint } from '../evaluate/stack-eval.js';
import type { Candidate } from './candidate.js';

// Rout at the headroom target must fall this far below the target before the look rules the design out, so the
// DC solve's own tolerance (the exact evaluation solves that point from another starting guess) cannot decide.
const ROUT_SLACK = 1e-3;

/**
 * Whether a candidate can meet the nominal targets, from its sizing and its mid-span DC solve alone (the first
 * steps of evaluateCandidate, done the same way), plus one DC solve at the headroom target. false only when a
 * target is surely missed: the widest device above the width limit, the current outside its window, σ above
 * the mismatch budget, a lower device below VDSsat, or Rout at the headroom target below the target (the exact
 * evaluation's Rout figure is the lowest over [target headroom, span], that point included). true otherwise,
 * and whenever the look cannot tell (the exact evaluation then decides, rejections included).
 */
export function mayMeetTargets(ctx: SolveContext, c: Candidate): boolean {
  return rangeSafe(() => look(ctx, c)) ?? true;
}

function look(ctx: SolveContext, c: Candidate): boolean {
  const s = ctx.spec;
  const slices = c.l.map((l) => ctx.slice(ctx.nominal, l));
  const sized = sizeStackDevices({
    shape: topologyOf(c.topology), slices, gmid: c.gmid, setpoints: c.setpoints, current: s.current, vmid: ctx.vmid,
  });
  if (!sized || sized.w.some((w) => w < ctx.wmin * (1 - 1e-9))) return true;
  if (s.wmax !== undefined && Math.max(...sized.w) > s.wmax) return false;
  const devices: StackDevice[] = slices.map((slice, k) => ({ slice, w: sized.w[k] }));
  const m = midPoint(devices, sized.gates, ctx.vmid, { i: s.current, nodes: sized.nodes }, ctx.ut(ctx.nominal));
  if (!m) return true;
  if (saturationMargin(m) < 0) return ctx.saturation === 'require';
  if (currentMargin(m.mid.i, s.current) < 0) return false;
  if (s.mismatch !== undefined && ctx.coeff) {
    const b = m.mid.devices[0];
    if (pelgromSigma(b.gm / b.id, devices[0].w, devices[0].slice.l, ctx.coeff) > s.mismatch) return false;
  }
  const at = sampleAt(devices, sized.gates, s.headroom, m.mid);
  return !(Number.isFinite(at.rout) && at.rout < s.rout * (1 - ROUT_SLACK));
}
