/**
 * The unity-gain frequency `size --spice` reads from an AC analysis (src/confirm unityGainFrequency), on responses
 * whose unity-gain frequency is known in closed form or by a root search here: AC points laid out as the confirm deck
 * writes them (AC_FROM .. AC_TO, AC_PER_DECADE a decade), v(out) = H(f), v(inp) = 1.
 */
import { describe, expect, it } from 'vitest';
import { AC_FROM, AC_PER_DECADE, AC_TO, unityGainFrequency } from '../src/confirm/index.js';

/** AC columns of a response H(f) = re + j·im, the input phasor 1 (or `vin`). */
function columns(h: (f: number) => [number, number], vin: [number, number] = [1, 0]) {
  const n = Math.round(Math.log10(AC_TO / AC_FROM) * AC_PER_DECADE) + 1;
  const freq = Float64Array.from({ length: n }, (_, k) => AC_FROM * 10 ** (k / AC_PER_DECADE));
  const re = [Float64Array.from(freq, (f) => h(f)[0]), Float64Array.from(freq, () => vin[0])];
  const im = [Float64Array.from(freq, (f) => h(f)[1]), Float64Array.from(freq, () => vin[1])];
  return { freq, re, im };
}

/** A0 / Π(1 + j f/p) as [re, im]. */
const poles = (a0: number, ps: number[]) => (f: number): [number, number] => {
  let re = a0;
  let im = 0;
  for (const p of ps) {
    // divide by (1 + j f/p)
    const d = 1 + (f / p) ** 2;
    [re, im] = [(re + (im * f) / p) / d, (im - (re * f) / p) / d];
  }
  return [re, im];
};

describe('unity-gain frequency of the open-loop gain', () => {
  it('single pole: fu = fp·√(A0² − 1) (single-pole amplifier, common practice), within 0.1 %', () => {
    for (const [a0, fp] of [[1000, 1e4], [300, 2.5e5], [5000, 3]] as const) {
      const exact = fp * Math.sqrt(a0 * a0 - 1);
      expect(unityGainFrequency(columns(poles(a0, [fp])))! / exact - 1).toBeCloseTo(0, 3);
    }
  });

  it('a second pole near the crossover lowers it below A0·fp; matches a bisection of |H| = 1 within 0.5 %', () => {
    const h = poles(1000, [1e4, 2e7]);
    const mag = (f: number) => Math.hypot(...h(f));
    let lo = 1e5;
    let hi = 1e9;
    for (let k = 0; k < 200; k++) {
      const mid = Math.sqrt(lo * hi);
      if (mag(mid) >= 1) lo = mid;
      else hi = mid;
    }
    const got = unityGainFrequency(columns(h))!;
    expect(got / lo - 1).toBeCloseTo(0, 2);
    // fu²·(1 + (fu/p2)²) ≈ (A0·fp)², so fu ≈ 0.91·A0·fp here.
    expect(got).toBeLessThan(0.95 * 1000 * 1e4);
  });

  it('the ratio of the two phasors counts, not v(out) alone; below unity from the start reads 0, never falling reads null', () => {
    // The same response with the input phasor 2·e^{j0.3}: the gain halves, so the single-pole crossing moves to fp·√(A0²/4 − 1).
    const v: [number, number] = [2 * Math.cos(0.3), 2 * Math.sin(0.3)];
    expect(unityGainFrequency(columns(poles(1000, [1e4]), v))! / (1e4 * Math.sqrt(250000 - 1)) - 1).toBeCloseTo(0, 3);
    expect(unityGainFrequency(columns(() => [0.5, 0]))).toBe(0);
    expect(unityGainFrequency(columns(() => [3, 0]))).toBeNull();
  });
});
