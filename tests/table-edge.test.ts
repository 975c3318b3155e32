import { describe, expect, it } from 'vitest';
import { sliceAt } from '../src/device/index.js';
import { covers } from '../src/stack/index.js';
import type { DeviceTable } from '../src/table/index.js';

// Invented table (not process data): a square-law id on axes chosen so one span is above 1 V (vgs), one below (vds)
// and one axis has a single point (vsb), where an absolute and a relative edge slack would disagree.
function table(): DeviceTable {
  const vgs = [0.3, 0.6, 0.9, 1.2, 1.5];
  const vds = [0.05, 0.15, 0.25];
  const vsb = [0];
  const id = new Float64Array(vgs.length * vds.length * vsb.length);
  let k = 0;
  for (const g of vgs) for (const d of vds) for (let s = 0; s < vsb.length; s++) id[k++] = 1e-4 * g * g * (1 + 0.1 * d);
  return {
    meta: {
      format: 'stackwright-table', version: 1, kit: 'invented', device: 'n', corner: 'tt', referenceWidth: 1e-6,
      sources: [], derived: {}, units: {}, note: 'invented test data',
    },
    axes: { l: Float64Array.of(1e-6), vgs: Float64Array.from(vgs), vds: Float64Array.from(vds), vsb: Float64Array.from(vsb) },
    data: { id },
  };
}

describe('table edges', () => {
  it('the stack layer’s range check accepts exactly the biases the slice can read', () => {
    // Contract (README "how a slice reads a table"): out of range throws kind 'range', nothing is extrapolated;
    // a range check that says "covered" for a point the lookup refuses would turn a guarded search into an error
    // (common practice: a guard and the operation it guards accept the same set).
    const s = sliceAt(table(), 1e-6);
    const reads = (g: number, d: number, b: number) => {
      try {
        s.jd(g, d, b);
        return true;
      } catch {
        return false;
      }
    };
    const offsets = [-3e-9, -1.5e-9, -6e-10, -1e-10, 0, 1e-10, 6e-10, 1.5e-9, 3e-9];
    let inside = 0;
    let outside = 0;
    for (const o of offsets) {
      const cases: Array<[number, number, number]> = [
        [1.5 + o, 0.15, 0], [0.3 - o, 0.15, 0], [0.9, 0.25 + o, 0], [0.9, 0.05 - o, 0], [0.9, 0.15, o],
      ];
      for (const [g, d, b] of cases) {
        const ok = reads(g, d, b);
        expect(covers(s, g, d, b), `vgs=${g} vds=${d} vsb=${b}`).toBe(ok);
        if (ok) inside++;
        else outside++;
      }
    }
    // Both sides of every edge were exercised.
    expect(inside).toBeGreaterThan(10);
    expect(outside).toBeGreaterThan(10);
  });
});
