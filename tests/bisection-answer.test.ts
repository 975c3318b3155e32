import { describe, expect, it } from 'vitest';
import { bisectionAnswer, type Trial } from '../src/numeric/bisection-answer.js';

// The shared kernel of the headroom crossing and the stage swing edge must give the answer plain bisection gives
// (the reference here: the textbook bisection method, halving [hold, fail] while it is wider than the resolution and
// keeping the end where the test holds; common practice), in fewer trials, for a test that holds on one side of one
// crossing — also when a trial made elsewhere (`known`) narrows the bracket.

function plain(holdX: number, failX: number, res: number, holds: (x: number) => boolean): number {
  let a = holdX;
  let b = failX;
  while (Math.abs(b - a) > res) {
    const m = 0.5 * (a + b);
    if (holds(m)) a = m;
    else b = m;
  }
  return a;
}

function test(root: number, up: boolean, shape: (d: number) => number) {
  let trials = 0;
  const margin = (x: number) => shape(up ? root - x : x - root);
  const at = (x: number): Trial<null> => ({ x, holds: margin(x) >= 0, margin: margin(x), sample: null });
  const trial = (x: number): Trial<null> => {
    trials++;
    return at(x);
  };
  return { at, trial, trials: () => trials, holds: (x: number) => margin(x) >= 0 };
}

describe('bisectionAnswer: plain bisection\'s answer in fewer trials', () => {
  // Trials allowed: bisection's K halvings (+1) for smooth margins; for a step margin the interpolation learns
  // nothing, and after K trials every step halves, so at most 2K.
  const shapes: Array<[string, (d: number) => number, number]> = [
    ['linear', (d) => d, 1],
    ['cubic', (d) => d * d * d + 0.01 * d, 1],
    ['saturating', (d) => Math.tanh(40 * d), 1],
    ['a step (margin carries no slope information)', (d) => (d >= 0 ? 1 : -1), 2],
  ];
  for (const [name, shape, factor] of shapes) {
    for (const up of [true, false]) {
      it(`${name} margin, holding ${up ? 'below' : 'above'} the crossing`, () => {
        for (let j = 0; j < 40; j++) {
          const res = 1e-3;
          const [holdX, failX] = up ? [0.2, 0.3] : [0.3, 0.2];
          const root = 0.2 + 0.1 * ((j * 0.6180339887) % 1);
          const t = test(root, up, shape);
          const got = bisectionAnswer(t.at(holdX), t.at(failX), res, t.trial);
          expect(got.x).toBe(plain(holdX, failX, res, t.holds));
          expect(got.holds).toBe(true);
          const k = Math.ceil(Math.log2(0.1 / res));
          expect(t.trials()).toBeLessThanOrEqual(factor === 1 ? k + 1 : 2 * k);
        }
      });
    }
  }

  it('a known trial inside the bracket, on either side of the crossing and off the grid, leaves the answer unchanged', () => {
    for (let j = 0; j < 40; j++) {
      const root = 0.2 + 0.1 * ((j * 0.6180339887) % 1);
      const t = test(root, false, (d) => d);
      const known = t.at(0.2 + 0.1 * ((j * 0.41421356) % 1) + 1e-7);
      const got = bisectionAnswer(t.at(0.3), t.at(0.2), 1e-3, t.trial, known);
      expect(got.x).toBe(plain(0.3, 0.2, 1e-3, t.holds));
      // The answer is a trial made at it (or the holding end itself).
      expect(t.holds(got.x)).toBe(true);
    }
  });

  it('returns the holding end when nothing on the grid beyond it holds', () => {
    const t = test(0.3 - 1e-5, true, (d) => d);
    const got = bisectionAnswer(t.at(0.3 - 1e-5), t.at(0.31), 1e-3, t.trial);
    expect(got.x).toBe(0.3 - 1e-5);
  });
});
