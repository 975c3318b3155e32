import { beforeAll, describe, expect, it } from 'vitest';
import { parseSpec, sizeSpec, type Kit } from '../src/index.js';
import { parseSizeResult } from '../src/solve/index.js';
import { StackwrightError } from '../src/errors.js';
import { demoKit, ensureDemoTables } from './helpers/cli.js';

let kit: Kit;
beforeAll(() => {
  ensureDemoTables();
  kit = demoKit('demo180');
});

// Invented targets on the invented demo kit: a single device cannot give 100 MΩ within 0.5 V, a cascode can
// (the demo spec marsh-wren.yaml sizes the same load), so one stack carries a headroom that was never reached.
const SPEC = `kit: demo180
supply: 1.8
stacks:
  - {name: load, device: p, topology: single, current: 10u, rout: 100meg, headroom: 0.5, span: 1.5}
  - {name: tail, device: n, topology: cascode, current: 40u, rout: 50meg, headroom: 0.45, span: 1.6}
`;

const errorOf = (text: string): StackwrightError => {
  try {
    parseSizeResult(text, 'r.json');
  } catch (e) {
    expect(e).toBeInstanceOf(StackwrightError);
    return e as StackwrightError;
  }
  throw new Error('no error');
};

describe('parseSizeResult', () => {
  it('reads a sized result back through JSON, with the unreached headroom restored to Infinity', () => {
    const { result } = sizeSpec(parseSpec(SPEC, 'spec.yaml'), kit);
    expect(result.stacks[0].feasible).toBe(false);
    expect(result.stacks[0].predicted.headroom).toBe(Infinity);
    // ECMA-262 JSON.stringify writes null for a non-finite number (RFC 8259 §6: JSON has no Infinity or NaN).
    const text = JSON.stringify(result);
    expect(text).toContain('"headroom":null');
    const back = parseSizeResult(text, 'r.json');
    expect(back.supply).toBe(1.8);
    expect(back.stacks[0].predicted.headroom).toBe(Infinity);
    expect(back.stacks[1].predicted.headroom).toBe(result.stacks[1].predicted.headroom);
    back.stacks.forEach((s, i) => {
      expect(s.devices.map((d) => [d.w, d.l, d.gate])).toEqual(result.stacks[i].devices.map((d) => [d.w, d.l, d.gate]));
    });
  });

  it('refuses text that is not a size result, naming where', () => {
    expect(errorOf('{"stacks": [').message).toMatch(/^r\.json: not valid JSON/);
    expect(errorOf('{"stacks": [').where).toBe('r.json');
    expect(errorOf('{"stacks": 3}').message).toMatch(/expected the JSON printed by/);
    expect(errorOf('null').message).toMatch(/expected the JSON printed by/);
    expect(errorOf('{"supply": 1.8, "stacks": [null]}').where).toBe('r.json: stacks[0].devices');
    expect(errorOf('{"supply": 1.8, "stacks": [{"devices": []}]}').where).toBe('r.json: stacks[0].devices');
    const e = errorOf('{"supply": 1.8, "stacks": [{"devices": [{"w": 1e-6, "l": 1e-6, "gate": 0.6}, {"w": 1e-6, "l": "1u", "gate": 1}]}]}');
    expect(e.where).toBe('r.json: stacks[0].devices[1].l');
    expect(e.kind).toBe('input');
  });
});

describe('parseSizeResult: a hand-edited or damaged result is refused before a netlist is written', () => {
  // The fields a netlist writes from: a width becomes `W=` of an M card, the type picks the rail and model, the name
  // goes into comment lines, the bias devices into diode cards (SPICE3: W and L of a MOSFET are positive numbers).
  const good = () => ({
    supply: 1.8,
    corners: ['tt'],
    stacks: [{
      name: 'tail', device: 'n', topology: 'cascode', feasible: true,
      devices: [{ role: 'bottom', w: 20e-6, l: 1e-6, gate: 0.6 }, { role: 'top', w: 30e-6, l: 0.5e-6, gate: 0.9 }],
      bias: [{ drives: 'bottom', w: 20e-6, l: 1e-6, current: 20e-6, voltage: 0.6 }, { drives: 'top', w: 2e-6, l: 0.5e-6, current: 20e-6, voltage: 0.9 }],
      predicted: { iout: 20e-6, rout: 5e7, headroom: 0.4, area: 3.5e-11, sigma: 0.005 },
    }],
  });
  type Good = ReturnType<typeof good>;
  const bad = (edit: (r: Good) => void) => {
    const r = good();
    edit(r);
    return errorOf(JSON.stringify(r));
  };

  it('reads the untouched result', () => {
    expect(parseSizeResult(JSON.stringify(good()), 'r.json').stacks[0].bias).toHaveLength(2);
  });

  it('names the field of a width, length or bias value that is not a positive number', () => {
    expect(bad((r) => (r.stacks[0].devices[0].w = -1e-6)).where).toBe('r.json: stacks[0].devices[0].w');
    expect(bad((r) => (r.stacks[0].devices[1].l = 0)).where).toBe('r.json: stacks[0].devices[1].l');
    expect(bad((r) => ((r.stacks[0].bias[0] as { w: unknown }).w = 'big')).where).toBe('r.json: stacks[0].bias[0].w');
    expect(bad((r) => (r.stacks[0].bias[1].current = 0)).where).toBe('r.json: stacks[0].bias[1].current');
    expect(bad((r) => ((r.stacks[0].bias[1] as { voltage: unknown }).voltage = null)).where).toBe('r.json: stacks[0].bias[1].voltage');
    expect(bad((r) => ((r.stacks[0] as { bias: unknown }).bias = undefined)).where).toBe('r.json: stacks[0].bias');
    // the sizes size --spice confirmed, which a netlist writes instead of the tables' design
    const corrected = (w: number) => (r: Good) => Object.assign(r.stacks[0], { corrected: { devices: [{ role: 'bottom', w, l: 1e-6, gate: 0.6 }, { role: 'top', w: 3e-5, l: 5e-7, gate: 0.9 }], bias: r.stacks[0].bias } });
    const fine = good();
    corrected(2e-5)(fine);
    expect(parseSizeResult(JSON.stringify(fine), 'r.json').stacks[0].devices[0].w).toBe(20e-6);
    expect(bad(corrected(0)).where).toBe('r.json: stacks[0].corrected.devices[0].w');
    expect(bad((r) => Object.assign(r.stacks[0], { corrected: { devices: [], bias: [] } })).where).toBe('r.json: stacks[0].corrected.devices');
  });

  it('names a device type, role or name a deck cannot carry', () => {
    expect(bad((r) => (r.stacks[0].device = 'q')).where).toBe('r.json: stacks[0].device');
    expect(bad((r) => (r.stacks[0].devices[0].role = 'x y')).where).toBe('r.json: stacks[0].devices[0].role');
    expect(bad((r) => (r.stacks[0].bias[0].drives = 'gate')).where).toBe('r.json: stacks[0].bias[0].drives');
    // a line break in a name would start a new SPICE line inside the comment that carries it
    expect(bad((r) => (r.stacks[0].name = 'tail\n.tran 1n 1u')).where).toBe('r.json: stacks[0].name');
    expect(bad((r) => ((r.stacks[0] as { predicted: unknown }).predicted = undefined)).where).toBe('r.json: stacks[0].predicted');
  });

  it('every refusal is one line, kind input', () => {
    const e = bad((r) => (r.stacks[0].devices[0].w = -1e-6));
    expect(e.kind).toBe('input');
    expect(e.message.split('\n')).toHaveLength(1);
  });
});

describe('parseSizeResult: a damaged gain stage is refused before its deck is written', () => {
  // SPICE3: a MOSFET's W and L are positive; a stage deck quotes the predicted gain and input voltage in its header.
  const stage = () => ({
    supply: 1.8, corners: ['tt'], stacks: [],
    stages: [{
      name: 'amp', feasible: true,
      input: { device: 'n', topology: 'single', devices: [{ role: 'bottom', w: 3e-6, l: 3e-7, gate: 0.6 }], bias: [] },
      load: { device: 'p', topology: 'single', devices: [{ role: 'bottom', w: 4e-6, l: 3e-7, gate: 1.0 }], bias: [{ drives: 'bottom', w: 4e-6, l: 3e-7, current: 1e-5, voltage: 1.0 }] },
      predicted: { gain: 100, swing: 0.8, vlow: 0.5, vhigh: 1.3, output: 0.9, vin: 0.6, gbw: null, cout: null, area: 2e-12, current: 1e-5 },
    }],
  });
  type Stage = ReturnType<typeof stage>;
  const bad = (edit: (r: Stage) => void) => {
    const r = stage();
    edit(r);
    return errorOf(JSON.stringify(r));
  };
  it('reads the untouched stage, and names a zero width, a bad type, a bad name or missing predicted figures', () => {
    expect(parseSizeResult(JSON.stringify(stage()), 'r.json').stages).toHaveLength(1);
    expect(bad((r) => (r.stages[0].input.devices[0].w = 0)).where).toBe('r.json: stages[0].input.devices[0].w');
    expect(bad((r) => (r.stages[0].load.device = 'x')).where).toBe('r.json: stages[0].load.device');
    expect(bad((r) => (r.stages[0].load.bias[0].l = -1)).where).toBe('r.json: stages[0].load.bias[0].l');
    expect(bad((r) => (r.stages[0].name = 'a\nb')).where).toBe('r.json: stages[0].name');
    expect(bad((r) => ((r.stages[0] as { predicted: unknown }).predicted = { gain: 1 })).where).toBe('r.json: stages[0].predicted');
  });
});
