import { describe, expect, it } from 'vitest';
import { compareStages } from '../src/solve/stage-port.js';
import type { StageResult, StageSide } from '../src/solve/stage-types.js';
import { device, nCascode, nTriple } from './fixtures/spice/stacks.js';

const side = (s: Pick<StageSide, 'device' | 'topology' | 'devices'>): StageSide => ({ ...s, bias: [] });
const stage = (load: StageSide): StageResult =>
  ({
    name: 'amp', feasible: true,
    input: side({ device: 'n', topology: 'single', devices: [device('bottom', 4e-6, 0.5e-6, 0.7)] }),
    load,
    predicted: { gain: 1000, swing: 0.8, vlow: 0.4, vhigh: 1.2, output: 0.9, vin: 0.7, gbw: null, cout: null, area: 1e-11, current: 1e-5 },
    curve: [],
    evaluated: 1,
  }) as StageResult;

describe('port compares stage devices by role', () => {
  // A cascode load's top device and a triple load's top device play the same part (the one at
  // the output); the triple's middle device has no counterpart (common practice in reading
  // cascode stacks, as for stacks in tests/port-roles.test.ts).
  it('a cascode load becoming a triple: top matches top, middle only on the new side', () => {
    const from = stage(side({ device: 'p', topology: 'cascode', devices: nCascode.devices }));
    const to = stage(side({ device: 'p', topology: 'triple', devices: nTriple.devices }));
    const rows = compareStages(from, to);
    const names = rows.map((r) => r.what);
    expect(new Set(names).size).toBe(names.length); // no role listed twice
    const get = (what: string) => rows.find((r) => r.what === what)!;
    const top = (s: typeof nCascode) => s.devices.find((d) => d.role === 'top')!;
    expect(get('load top W')).toMatchObject({ from: top(nCascode).w, to: top(nTriple).w });
    expect(get('load top gate')).toMatchObject({ from: top(nCascode).gate, to: top(nTriple).gate });
    expect(get('load middle W').from).toBeNaN();
    expect(get('load middle W').to).toBe(nTriple.devices.find((d) => d.role === 'middle')!.w);
    expect(names.filter((n) => /^load .* W$/.test(n))).toEqual(['load bottom W', 'load middle W', 'load top W']);
  });

  it('a cascode input becoming a single one keeps only bottom on both sides', () => {
    const from = stage(side({ device: 'p', topology: 'single', devices: [device('bottom', 2e-6, 1e-6, 1.0)] }));
    from.input = side({ device: 'n', topology: 'cascode', devices: nCascode.devices });
    const to = stage(side({ device: 'p', topology: 'single', devices: [device('bottom', 2e-6, 1e-6, 1.0)] }));
    const rows = compareStages(from, to);
    expect(rows.find((r) => r.what === 'input bottom W')).toMatchObject({ from: nCascode.devices[0].w, to: 4e-6 });
    expect(rows.find((r) => r.what === 'input top W')!.to).toBeNaN();
  });
});
