import { describe, expect, it } from 'vitest';
import { compareResults } from '../src/solve/compare.js';
import { nCascode, nTriple, device, stack } from './fixtures/spice/stacks.js';

describe('port compares devices by role', () => {
  // A cascode's top device and a triple's top device play the same part (the one at the output);
  // the triple's middle device has no counterpart (common practice in reading cascode stacks).
  it('matches top with top when a cascode becomes a triple; the middle shows only on the new side', () => {
    const triple = stack('deep', 'n', 'triple', nTriple.devices, [
      { drives: 'bottom', w: 1e-6, l: 1e-6, current: 2e-5, voltage: 0.6 },
      { drives: 'middle', w: 1e-6, l: 1e-6, current: 2e-5, voltage: 0.9 },
      { drives: 'top', w: 1e-6, l: 1e-6, current: 2e-5, voltage: 1.2 },
    ]);
    const rows = compareResults(nCascode, triple);
    const names = rows.map((r) => r.what);
    expect(new Set(names).size).toBe(names.length); // no role listed twice
    const get = (what: string) => rows.find((r) => r.what === what)!;
    expect(get('top W')).toMatchObject({ from: 10e-6, to: 8e-6 });
    expect(get('top gate')).toMatchObject({ from: 1.0, to: 1.2 });
    expect(get('middle W').from).toBeNaN();
    expect(get('middle W').to).toBe(8e-6);
    expect(get('bias(top) voltage')).toMatchObject({ from: 1.0, to: 1.2 });
    expect(get('bias(middle) W').from).toBeNaN();
    // Order from the rail outwards.
    expect(names.filter((n) => / W$/.test(n) && !n.startsWith('bias'))).toEqual(['bottom W', 'middle W', 'top W']);
  });

  it('and the other way: a triple becoming a single keeps only bottom on both sides', () => {
    const single = stack('one', 'n', 'single', [device('bottom', 3e-6, 1e-6, 0.7)], []);
    const rows = compareResults(nTriple, single);
    expect(rows.find((r) => r.what === 'bottom W')).toMatchObject({ from: 8e-6, to: 3e-6 });
    expect(rows.find((r) => r.what === 'top W')!.to).toBeNaN();
  });
});
