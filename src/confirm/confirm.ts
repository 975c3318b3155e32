import { availableParallelism } from 'node:os';
import { StackwrightError } from '../errors.js';
import type { RunOptions } from '../spice/run.js';
import { runBatch, type BatchColumns } from './batch.js';
import type { ConfirmItem } from './hook.js';
import { cornerModels, type ModelSource } from './sections.js';
import type { Confirmation, Miss } from './types.js';

/** Simulated rounds a design may take before it is declared missing: the table design and up to three corrections. */
export const MAX_ROUNDS = 4;
/** Extra rounds `tighten` may spend shrinking confirmed designs. */
export const TIGHTEN_ROUNDS = 2;
/** Sweep step of the shared sweep, V. */
export const SWEEP_STEP = 0.005;

export interface ConfirmOptions extends ModelSource {
  /** Corners to simulate (nominal first). */
  corners: string[];
  supply: number;
  /** Shrink confirmed designs that show headroom to spare, and confirm again. */
  tighten?: boolean;
  /** How ngspice is run (binary, timeout). */
  run?: RunOptions;
  /** Called before and after every ngspice run. */
  onProgress?: (p: { round: number; runs: number; done: number; designs: number }) => void;
  title?: string;
}

/** Where one design stands in the confirm loop. */
export interface State<F extends { corner: string }, C> {
  item: ConfirmItem<F, C>;
  tag: string;
  rounds: number;
  phase: 'correct' | 'tighten' | 'done';
  confirmed: boolean;
  tightened: boolean;
  tightenLeft: number;
  last: F[];
  misses: Miss[];
}

/**
 * Confirm designs in ngspice: every round simulates all pending designs at
 * every corner, one deck per corner with all of them as independent circuits
 * (library sections cannot share a deck); designs that miss a target are
 * corrected and simulated again, up to MAX_ROUNDS; with `tighten`, confirmed
 * designs with headroom to spare are shrunk and confirmed again (a shrink that
 * fails is undone).
 */
export async function confirmItems<F extends { corner: string }, C = Confirmation>(items: ConfirmItem<F, C>[], opts: ConfirmOptions): Promise<C[]> {
  const models = opts.corners.map((c) => cornerModels(opts, c, opts.corners));
  const states: State<F, C>[] = items.map((item, k) => ({
    item, tag: `c${k + 1}`, rounds: 0, phase: 'correct', confirmed: false, tightened: false,
    tightenLeft: opts.tighten ? TIGHTEN_ROUNDS : 0, last: [], misses: [],
  }));
  for (let round = 1; ; round++) {
    const pending = states.filter((s) => s.phase !== 'done');
    if (pending.length === 0) break;
    const data = await simulateRound(pending, models, round, opts);
    for (const s of pending) {
      const results = Array.from({ length: s.item.variants() }, (_, k) => {
        const figures = opts.corners.map((c, i) => s.item.measure(data[i].get(variantTag(s.tag, k))!, c));
        return { figures, misses: figures.flatMap((f) => s.item.misses(f)) };
      });
      const k = results.length === 1 ? 0 : s.item.pick(results);
      s.item.select(k);
      s.rounds++;
      advance(s, results[k].figures, results[k].misses);
    }
  }
  return states.map((s) => s.item.outcome(s.last, s.misses, s.rounds, s.confirmed, s.tightened));
}

const variantTag = (tag: string, k: number) => `${tag}v${k}`;

/**
 * One round's verdict on a design: confirmed (then, with rounds of `tighten` left, a shrink proposed), corrected, or
 * done (when every round missed, with the nearest design simulated, not merely the last); in a tighten round a smaller design that missed is reverted to the last confirmed one and its figures.
 * Exported for tests of this state machine.
 */
export function advance<F extends { corner: string }, C>(s: State<F, C>, figures: F[], misses: Miss[]): void {
  if (s.phase === 'tighten') {
    if (misses.length === 0) {
      s.tightened = true;
      s.item.keep(figures);
      s.last = figures;
    } else {
      // The smaller design missed: keep the last confirmed one and its figures.
      s.item.revert();
      s.phase = 'done';
      return;
    }
  } else {
    s.last = figures;
    s.misses = misses;
    if (misses.length > 0) {
      s.item.hold(figures, misses);
      if (s.rounds < MAX_ROUNDS && s.item.correct(figures, misses)) {
        s.phase = 'correct';
        return;
      }
      // No round confirmed a design: report the nearest one simulated, which may be an earlier round's.
      const near = s.item.nearest();
      s.last = near.figures;
      s.misses = near.misses;
      s.phase = 'done';
      return;
    }
    s.confirmed = true;
    s.item.keep(figures);
  }
  if (s.tightenLeft > 0 && s.item.shrink(figures)) {
    s.tightenLeft--;
    s.phase = 'tighten';
  } else s.phase = 'done';
}

async function simulateRound<F extends { corner: string }, C>(
  pending: State<F, C>[], models: string[], round: number, opts: ConfirmOptions,
): Promise<Map<string, BatchColumns>[]> {
  const top = Math.min(opts.supply, Math.max(...pending.map((s) => s.item.sweepTop)) + 2 * SWEEP_STEP);
  const circuits = pending.flatMap((s) => Array.from({ length: s.item.variants() }, (_, k) => s.item.circuit(variantTag(s.tag, k), k)));
  const report = (done: number) => opts.onProgress?.({ round, runs: models.length, done, designs: circuits.length });
  report(0);
  // The corners' decks run side by side (ngspice is single-threaded), at most one per available core.
  const out: Map<string, BatchColumns>[] = new Array(models.length);
  let next = 0;
  let done = 0;
  const worker = async () => {
    for (let i = next++; i < models.length; i = next++) {
      const deck = { title: `${opts.title ?? 'stackwright confirm'}, corner ${opts.corners[i]}, round ${round}`, models: models[i], supply: opts.supply, top, step: SWEEP_STEP, circuits };
      out[i] = await runCorner(deck, opts, i);
      report(++done);
    }
  };
  await Promise.all(Array.from({ length: Math.min(models.length, Math.max(1, availableParallelism())) }, worker));
  return out;
}

async function runCorner(deck: Parameters<typeof runBatch>[0], opts: ConfirmOptions, i: number): Promise<Map<string, BatchColumns>> {
  try {
    return await runBatch(deck, opts.run);
  } catch (e) {
    if (!(e instanceof StackwrightError)) throw e;
    const reason = e.message.replace(/^ngspice: /, '');
    if (/not found on PATH/.test(reason)) {
      throw new StackwrightError('ngspice is not installed (not on PATH); install the Debian package "ngspice": sudo apt-get install ngspice', { where: '--spice' });
    }
    throw new StackwrightError(reason.replace(/^ngspice failed \(exit [^)]*\): /, ''), { where: `ngspice, corner ${opts.corners[i]} (${deck.models.split('\n')[0]})` });
  }
}
