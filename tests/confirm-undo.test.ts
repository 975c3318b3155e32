import { beforeAll, describe, expect, it } from 'vitest';
import { sizeStage, type Kit } from '../src/index.js';
import type { StageSpec } from '../src/design/types.js';
import { advance, TIGHTEN_ROUNDS, type State } from '../src/confirm/confirm.js';
import { stageItem } from '../src/confirm/stage-item.js';
import type { StageConfirmation, StageSimulatedFigures } from '../src/confirm/stage-types.js';
import type { Miss } from '../src/confirm/types.js';
import { demoKits } from './helpers/cli.js';

// `size --spice --tighten` (README): a confirmed design with margin to spare is shrunk and simulated again, and "a
// smaller design that misses is undone". This drives the confirm loop's own state machine (advance) with a real gain
// stage item and simulated figures given by the test instead of an ngspice run, so the undo path runs on purpose: the
// shrunk stage is reported to miss its swing, and the outcome must be the confirmed design with its own figures.

let kit: Kit;
const spec: StageSpec = {
  name: 'undo', current: 10e-6, gain: 200, swing: 0.9, output: 0.9, objective: 'area',
  input: { device: 'n', topology: 'single' }, load: { topology: 'cascode' },
} as StageSpec;
beforeAll(() => {
  ({ kits: { demo180: kit } } = demoKits());
});

const figures = (swing: number, gain: number): StageSimulatedFigures[] => [
  { corner: 'tt', gain, vlow: 0.9 - swing / 2, vhigh: 0.9 + swing / 2, swing, vin: 0.5, gbw: null, curve: [], response: [] },
];

describe('confirm loop: a tightened stage that misses is undone', () => {
  it('keeps the confirmed design and its simulated figures, not the shrunk one', () => {
    const design = sizeStage(spec, kit, { supply: 1.8, corners: ['tt'] }).results[0];
    expect(design.feasible).toBe(true);
    const item = stageItem(design, spec, { kit, supply: 1.8, models: { n: 'nch', p: 'pch' } });
    const s: State<StageSimulatedFigures, StageConfirmation> = {
      item, tag: 'c1', rounds: 1, phase: 'correct', confirmed: false, tightened: false, tightenLeft: TIGHTEN_ROUNDS, last: [], misses: [],
    };
    // Round 1: the table design meets the targets with 150 mV of swing and 50 % of gain to spare: confirmed, and
    // the item proposes a smaller variant.
    const confirmedFigures = figures(spec.swing + 0.15, 1.5 * spec.gain);
    advance(s, confirmedFigures, []);
    expect(s.confirmed).toBe(true);
    expect(s.phase).toBe('tighten');
    item.select(0);
    const shrunkCircuit = item.circuit('c1v0', 0);
    // Round 2: the smaller stage misses its swing.
    const miss: Miss = { target: 'swing', required: spec.swing, achieved: spec.swing - 0.02, at: null, device: null, corner: 'tt' } as Miss;
    s.rounds++;
    advance(s, figures(spec.swing - 0.02, 1.4 * spec.gain), [miss]);
    expect(s.phase).toBe('done');
    expect(s.tightened).toBe(false);
    const out = s.item.outcome(s.last, s.misses, s.rounds, s.confirmed, s.tightened);
    expect(out.confirmed).toBe(true);
    expect(out.misses).toEqual([]);
    expect(out.tightened).toBeUndefined();
    // The figures reported are the confirmed design's, and no corrected sizes are reported (the table design stands).
    expect(out.simulated.swing).toBe(confirmedFigures[0].swing);
    expect(out.corrected).toBeUndefined();
    // And the next deck would simulate the confirmed design again, not the shrunk one.
    expect(item.circuit('c1v0', 0)).not.toEqual(shrunkCircuit);
    expect(item.circuit('c1v0', 0)).toEqual(stageItem(design, spec, { kit, supply: 1.8, models: { n: 'nch', p: 'pch' } }).circuit('c1v0', 0));
  });

  it('a shrink that meets the targets is kept and reported as tightened', () => {
    const design = sizeStage(spec, kit, { supply: 1.8, corners: ['tt'] }).results[0];
    const item = stageItem(design, spec, { kit, supply: 1.8, models: { n: 'nch', p: 'pch' } });
    const s: State<StageSimulatedFigures, StageConfirmation> = {
      item, tag: 'c1', rounds: 1, phase: 'correct', confirmed: false, tightened: false, tightenLeft: 1, last: [], misses: [],
    };
    advance(s, figures(spec.swing + 0.15, 1.5 * spec.gain), []);
    expect(s.phase).toBe('tighten');
    item.select(0);
    s.rounds++;
    const after = figures(spec.swing + 0.01, 1.2 * spec.gain);
    advance(s, after, []);
    expect(s.phase).toBe('done');
    const out = s.item.outcome(s.last, s.misses, s.rounds, s.confirmed, s.tightened);
    expect(out.tightened).toBe(true);
    expect(out.simulated.swing).toBe(after[0].swing);
    expect(out.corrected!.area).toBeLessThan(design.predicted.area);
  });
});

// README ("Correction"): when no round meets every target, the design reported is the nearest of all the rounds
// simulated, not merely the last one. The state machine is driven as above, with figures given by the test.
describe('confirm loop: when every round misses, the nearest design simulated is reported', () => {
  const gainMiss = (gain: number): Miss => ({ target: 'gain', required: spec.gain, achieved: gain, at: null, device: null, corner: 'tt' }) as Miss;
  // Rounds until the loop is done; each round's simulated gain is taken from `gains` (swing always met).
  const run = (gains: number[]) => {
    const design = sizeStage(spec, kit, { supply: 1.8, corners: ['tt'] }).results[0];
    const item = stageItem(design, spec, { kit, supply: 1.8, models: { n: 'nch', p: 'pch' } });
    const s: State<StageSimulatedFigures, StageConfirmation> = {
      item, tag: 'c1', rounds: 0, phase: 'correct', confirmed: false, tightened: false, tightenLeft: 0, last: [], misses: [],
    };
    const circuits: unknown[] = [];
    for (const gain of gains) {
      if (s.phase === 'done') break;
      item.select(0);
      circuits.push(item.circuit('c1v0', 0));
      s.rounds++;
      advance(s, figures(spec.swing + 0.05, gain), [gainMiss(gain)]);
    }
    return { s, design, circuits, out: s.item.outcome(s.last, s.misses, s.rounds, s.confirmed, s.tightened) };
  };

  it('a table design missing by 3 % stands when every correction misses by more', () => {
    const { s, out, circuits, design } = run([0.97 * spec.gain, 0.5 * spec.gain, 0.6 * spec.gain, 0.55 * spec.gain]);
    expect(s.phase).toBe('done');
    expect(s.rounds).toBe(4);
    expect(out.confirmed).toBe(false);
    expect(out.simulated.gain).toBe(0.97 * spec.gain);
    expect(out.misses).toEqual([gainMiss(0.97 * spec.gain)]);
    // The table design is reported as it was (no corrected sizes), and it is what a further deck would hold.
    expect(out.corrected).toBeUndefined();
    expect(s.item.circuit('c1v0', 0)).toEqual(circuits[0]);
    expect(s.item.circuit('c1v0', 0)).toEqual(stageItem(design, spec, { kit, supply: 1.8, models: { n: 'nch', p: 'pch' } }).circuit('c1v0', 0));
  });

  it('a correction that came nearest is reported with its sizes, not the later ones', () => {
    const { out, circuits } = run([0.8 * spec.gain, 0.99 * spec.gain, 0.7 * spec.gain, 0.9 * spec.gain]);
    expect(out.simulated.gain).toBe(0.99 * spec.gain);
    expect(out.corrected).toBeDefined();
    expect(circuits[1]).not.toEqual(circuits[0]);
  });
});
