import { describe, expect, it } from 'vitest';
import { chooseResult, shortfall } from '../src/solve/choose.js';
import type { StackResult } from '../src/solve/types.js';
import type { StackSpec } from '../src/design/types.js';

const spec: StackSpec = { name: 's', device: 'n', topology: 'auto', current: 1e-5, rout: 1e8, headroom: 0.5, span: 1.6, objective: 'area' };
const result = (topology: StackResult['topology'], feasible: boolean, rout: number, headroom: number, area: number): StackResult => ({
  name: 's', device: 'n', topology, feasible, devices: [], bias: [], curve: [], evaluated: 0,
  predicted: { iout: 1e-5, rout, headroom, area, biasArea: 0 },
});

describe('chooseResult (auto topology)', () => {
  it('takes the best feasible by the objective', () => {
    const r = [result('single', false, 1e6, Infinity, 1e-12), result('cascode', true, 2e8, 0.4, 5e-11), result('triple', true, 1.1e8, 0.45, 2e-11)];
    expect(chooseResult(r, spec).topology).toBe('triple');
    expect(chooseResult(r, { ...spec, objective: 'headroom' }).topology).toBe('cascode');
    expect(chooseResult(r, { ...spec, objective: 'rout' }).topology).toBe('cascode');
  });
  it('with none feasible, takes the nearest to the targets, not the first', () => {
    const r = [result('single', false, 1e6, Infinity, 1e-12), result('cascode', false, 0.9e8, 0.5, 5e-11), result('triple', false, 2e8, 0.7, 2e-11)];
    // The same distance the search ranks with: Rout missing in natural-log units, headroom per 50 mV.
    // cascode ln(1e8/0.9e8) = 0.105; triple (0.7 − 0.5)/0.05 = 4; single ln(100) = 4.6 plus a never-met headroom.
    expect(shortfall(r[1], spec)).toBeCloseTo(Math.log(1 / 0.9), 12);
    expect(shortfall(r[2], spec)).toBeCloseTo(4, 9);
    expect(shortfall(r[0], spec)).toBeGreaterThan(shortfall(r[2], spec));
    expect(chooseResult(r, spec).topology).toBe('cascode');
  });
});
