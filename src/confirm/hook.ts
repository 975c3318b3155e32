import type { BatchCircuit, BatchColumns } from './batch.js';
import type { Confirmation, Miss, Simulated, SimulatedFigures } from './types.js';

/**
 * One design the confirm loop simulates, checks and corrects. Stacks implement
 * it (stack-item.ts); a gain stage plugs in the same way with its own circuit
 * (input sweep mapped from the shared sweep node), measurement and correction.
 */
export interface ConfirmItem<F extends { corner: string } = SimulatedFigures, C = Confirmation> {
  name: string;
  /** Highest value of the shared sweep the circuit needs, V. */
  sweepTop: number;
  /** Designs to simulate this round side by side (1, or a correction's variants). */
  variants(): number;
  /** Variant `k` as one independent circuit of a batched deck. */
  circuit(tag: string, k: number): BatchCircuit;
  /** Of the variants simulated, the one to continue with. */
  pick(results: ReadonlyArray<{ figures: F[]; misses: Miss[] }>): number;
  /** Continue with variant `k`. */
  select(k: number): void;
  /** Figures from this circuit's columns at one corner. */
  measure(data: BatchColumns, corner: string): F;
  /** Targets missed at one corner. */
  misses(f: F): Miss[];
  /** Propose variants for another round after `figures` missed; false when no step can help. */
  correct(figures: F[], misses: Miss[]): boolean;
  /** Propose a smaller variant of a confirmed design with margin to spare; false when there is nothing to take back. */
  shrink(figures: F[]): boolean;
  /** Go back to the last design simulation confirmed (a shrink that failed). */
  revert(): void;
  /** Mark the current design as confirmed by `figures`. */
  keep(figures: F[]): void;
  /** The current design missed with these figures: hold it when it is nearer the targets than every design tried before. */
  hold(figures: F[], misses: Miss[]): void;
  /** Go back to the nearest design held (no round confirmed one); its figures and misses. */
  nearest(): { figures: F[]; misses: Miss[] };
  /** The outcome after the last round. */
  outcome(last: F[], misses: Miss[], rounds: number, confirmed: boolean, tightened: boolean): C;
}

/** A design simulated, with its figures at every corner and what it missed. */
export interface Tried<D, F> {
  design: D;
  figures: F[];
  misses: Miss[];
}

/**
 * The nearest of the missing designs tried, by an item's own order of variants: `prefer(a, b)` is true when a comes
 * before b. A later design replaces the one held only when it is strictly nearer, so a tie keeps the less corrected one.
 */
export function nearestKeeper<D, F>(prefer: (a: Tried<D, F>, b: Tried<D, F>) => boolean): { hold(t: Tried<D, F>): void; back(use: (design: D) => void): Tried<D, F> } {
  let held: Tried<D, F> | null = null;
  return {
    hold(t) {
      if (held === null || prefer(t, held)) held = t;
    },
    /** Hand the design held to `use` (the item continues with it); its figures and misses. Called after a hold. */
    back(use) {
      const t = held as Tried<D, F>;
      use(t.design);
      return t;
    },
  };
}

/** Nominal figures on top, every corner below (nominal first). */
export function simulatedOf<F extends SimulatedFigures>(figures: F[]): Simulated {
  const strip = ({ corner, iout, rout, routAtTarget, headroom, curve }: SimulatedFigures): SimulatedFigures => ({ corner, iout, rout, routAtTarget, headroom, curve });
  const all = figures.map(strip);
  return { ...all[0], corners: all };
}
