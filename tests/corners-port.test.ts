import { beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { evaluateAtCorner, loadKit, parseSpec, pelgromSigma, portSpec, sizeSpec, type Kit } from '../src/index.js';
import { ensureDemoTables, REPO, demoKit } from './helpers/cli.js';
import { statusLine } from '../src/report/rows.js';
import { harderTargets } from '../src/solve/compare.js';
import { harderText } from '../src/report/port-harder.js';
import { renderPortText } from '../src/report/port-text.js';
import { toJson } from '../src/cli/io.js';

let k180: Kit;
let k090: Kit;
beforeAll(() => {
  ensureDemoTables();
  k180 = demoKit('demo180');
  k090 = demoKit('demo090');
});

const sink = (rout: string, headroom: number, current = '20u', span = 1.6) =>
  parseSpec(`kit: demo180\nsupply: 1.8\nstacks:\n  - {name: s, device: n, topology: cascode, current: ${current}, rout: ${rout}, headroom: ${headroom}, span: ${span}}\n`, 'corner.yaml');

describe('pelgromSigma (worked example)', () => {
  it('matches a hand computation of Pelgrom\'s relation', () => {
    // Pelgrom, Duinmaijer & Welbers, IEEE JSSC 24(5), 1989, with the current form of Kinget, IEEE JSSC 40(6), 2005:
    // σ(ΔI/I)² = (gm/ID)²·A_VT²/(W·L) + A_β²/(W·L). Hand computation: gm/ID = 10 /V, A_VT = 5 mV·µm,
    // A_β = 1 %·µm, W·L = 10 µm × 1 µm = 10 µm²: (10·0.005)² = 2.5e-3, (0.01)² = 1e-4, sum 2.6e-3 µm²,
    // divided by 10 µm² = 2.6e-4, σ = 1.6125 %.
    const sigma = pelgromSigma(10, 10e-6, 1e-6, { avt: 5e-3 * 1e-6, abeta: 0.01 * 1e-6 });
    expect(sigma).toBeCloseTo(0.016125, 5);
  });
});

describe('corners on the demo kit', () => {
  it('a design sized for tt alone fails the slow corner; sized for [tt, ss] it meets both when re-evaluated', () => {
    // Built for the case: at ss (higher VT, lower mobility, 125 °C) the narrow cascode-gate diode's VGS rises more
    // than the wide cascode's, so the bottom device's VDS and with it the headroom grow; 0.45 V is tight at tt.
    const spec = sink('50meg', 0.45);
    const tt = sizeSpec(spec, k180).result.stacks[0];
    expect(tt.feasible).toBe(true);
    const atSs = evaluateAtCorner(tt, spec.stacks[0], k180, 'ss', spec.supply);
    expect(atSs.feasible).toBe(false);
    expect(atSs.predicted.headroom).toBeGreaterThan(0.45);

    const both = sizeSpec({ ...spec, corners: ['tt', 'ss'] }, k180).result;
    expect(both.corners).toEqual(['tt', 'ss']);
    const s = both.stacks[0];
    expect(s.feasible).toBe(true);
    for (const corner of ['tt', 'ss']) {
      const re = evaluateAtCorner(s, spec.stacks[0], k180, corner, spec.supply);
      expect(re.feasible, corner).toBe(true);
      expect(re.predicted.rout, corner).toBeGreaterThanOrEqual(50e6);
      expect(re.predicted.headroom, corner).toBeLessThanOrEqual(0.45 + 1e-9);
    }
    // The report names each corner with its own gates: the bias devices re-derive them.
    expect(s.corners?.map((c) => c.corner)).toEqual(['tt', 'ss']);
    expect(s.corners?.[1].gates[1]).toBeGreaterThan(s.corners?.[0].gates[1] ?? Infinity);
  });
});

describe('nearest points of a spec with several corners', () => {
  it('name the nominal corner they hold at, so a miss at another corner does not read as contradicted', () => {
    // Infeasible only at ss: at tt some design meets 50 MΩ at 0.36 V (the nearest Rout at the headroom target is
    // above the target), so an unlabelled "Rout reaches 118 MΩ at the headroom target" beside "ss: Rout 13 MΩ <
    // 50 MΩ" would contradict the verdict.
    const spec = { ...sink('50meg', 0.36, '40u'), corners: ['tt', 'ff', 'ss'] };
    const s = sizeSpec(spec, k180).result.stacks[0];
    expect(s.feasible).toBe(false);
    const corner = s.binding?.corner ?? '';
    expect(corner).toMatch(/^(ff|ss)$/);
    expect(s.nearest?.corner).toBe('tt');
    expect(s.nearest?.routAtHeadroom).toBeGreaterThanOrEqual(50e6);
    const text = statusLine(s);
    expect(text).toMatch(/at the headroom target Rout reaches [\d.]+ MΩ at corner tt/);
    // The shown design really misses at the binding corner when re-evaluated there.
    const re = evaluateAtCorner(s, spec.stacks[0], k180, corner, spec.supply);
    expect(re.feasible).toBe(false);
  });
});

describe('port demo180 -> demo090', () => {
  it('every feasible ported design meets its targets when re-evaluated on the new kit\'s tables', () => {
    const spec = sink('20meg', 0.4, '20u', 1.6);
    const run = portSpec(spec, k180, k090);
    expect(run.toSpec.supply).toBeCloseTo(1.2, 9); // capped at the top of demo090's vds axis
    expect(run.toSpec.stacks[0].span).toBeCloseTo(1.0, 9); // keeps its 0.2 V distance from the far rail
    const s = run.stacks[0];
    expect(s.to.feasible).toBe(true);
    const re = evaluateAtCorner(s.to, run.toSpec.stacks[0], k090, 'tt', run.toSpec.supply);
    expect(re.feasible).toBe(true);
    expect(re.predicted.rout).toBeGreaterThanOrEqual(20e6);
    expect(re.predicted.headroom).toBeLessThanOrEqual(0.4 + 1e-9);
    expect(Math.abs(re.predicted.iout - 20e-6) / 20e-6).toBeLessThan(0.01);
    // Side by side: every size has an old and a new value with a percent change.
    const w = s.changes.find((c) => c.what === 'bottom W');
    expect(w && Number.isFinite(w.from) && Number.isFinite(w.to)).toBe(true);
    expect(w?.percent).toBeCloseTo((100 * ((w?.to ?? 0) - (w?.from ?? 0))) / (w?.from ?? 1), 9);
  });

  it('a spec the new kit cannot meet is reported infeasible with the binding target', () => {
    // demo090's lower intrinsic gain (shorter Early voltage, stronger DIBL) cannot give 200 MΩ at 0.35 V with 10 µA.
    const spec = sink('200meg', 0.35, '10u', 1.0);
    const run = portSpec(spec, k180, k090);
    const s = run.stacks[0];
    expect(s.from.feasible).toBe(true);
    expect(s.to.feasible).toBe(false);
    expect(s.to.binding?.target).toBe('rout');
    // Data, not a sentence (project rule): the feasibility item carries the binding verdict in SI units.
    const f = s.harder.find((h) => h.quantity === 'feasible');
    expect(f).toEqual({ quantity: 'feasible', from: true, to: false, binding: s.to.binding });
    expect(renderPortText(run, { color: false })).toMatch(/harder on demo090: infeasible on the new kit: /);
  });
});

describe('search over several corners (reed180, tt and ss)', () => {
  // The high-current p-type source of demo-tables/specs/marsh-wren-spice.yaml: at ss the bias diodes track the
  // output devices only to within about 1–2 %, so many designs that meet every target at tt miss the current at ss.
  const spec = parseSpec(
    'kit: reed180\ncorner: [tt, ss]\nsupply: 1.8\nstacks:\n' +
      '  - {name: excitation, device: p, topology: cascode, current: 200u, rout: 1meg, headroom: 0.4, span: 1.5, objective: area}\n',
    'excitation.yaml',
  );
  const stack = spec.stacks[0];
  let k: Kit;
  beforeAll(() => {
    k = loadKit('reed180', { tables: join(REPO, 'tables') });
  });

  // Targets judged directly from the corner re-evaluation against the spec: Rout ≥ 1 MΩ, headroom ≤ 0.4 V, and the
  // current within the README's 1 % window of 200 µA at mid-span (a common-practice accuracy for bias sources).
  const meets = (r: ReturnType<typeof evaluateAtCorner>, corner: string) => {
    expect(r.predicted.rout, corner).toBeGreaterThanOrEqual(1e6);
    expect(r.predicted.headroom, corner).toBeLessThanOrEqual(0.4 + 1e-9);
    expect(Math.abs(r.predicted.iout - 200e-6) / 200e-6, corner).toBeLessThan(0.01);
  };

  it('a feasible cascode exists: a fixed witness design meets every target at tt and at ss when re-evaluated', () => {
    // Witness (a cascode with its two bias diodes, written out by hand from one run): its existence check uses only
    // the corner re-evaluation (bias diodes give the gates at each corner), none of the search.
    const witness = {
      name: 'excitation', device: 'p', topology: 'cascode', feasible: true, evaluated: 0, curve: [], predicted: {},
      devices: [
        { role: 'bottom', l: 2e-6, w: 884.745779e-6, vsb: 0, vds: 0.209375 },
        { role: 'top', l: 0.3e-6, w: 1009.772988e-6, vsb: 0.209375, vds: 0.740625 },
      ],
      bias: [
        { drives: 'bottom', w: 855.832378e-6, l: 2e-6, current: 200e-6, voltage: 1.18381 },
        { drives: 'top', w: 28.827719e-6, l: 0.3e-6, current: 200e-6, voltage: 0.95926 },
      ],
    } as unknown as Parameters<typeof evaluateAtCorner>[0];
    for (const corner of ['tt', 'ss']) {
      const r = evaluateAtCorner(witness, stack, k, corner, spec.supply);
      expect(r.feasible, corner).toBe(true);
      meets(r, corner);
    }
  });

  it('the search returns a design meeting every target at every corner when one exists', () => {
    // Before the search judged shortfalls at every corner it returned a cascode meeting tt but 1.74 % off at ss.
    const s = sizeSpec(spec, k).result.stacks[0];
    expect(s.feasible).toBe(true);
    expect(s.corners?.map((c) => c.corner)).toEqual(['tt', 'ss']);
    for (const corner of ['tt', 'ss']) {
      const r = evaluateAtCorner(s, stack, k, corner, spec.supply);
      expect(r.feasible, corner).toBe(true);
      meets(r, corner);
    }
  });
});

describe('port: what got harder', () => {
  it('does not call a Rout margin harder when it moved less than the search itself may leave', () => {
    // The marsh-wren ota-load (triple, 100 MΩ) is sized to just meet Rout on both kits: 1.008x of the target on
    // demo180, 1.006x on demo090. The search finds Rout within 5 % of the exhaustive optimum (README, tests/optimal),
    // so a 0.2 % drop says nothing about the kit; it was listed as "rout: margin 1.01x -> 1.01x of the target".
    const spec = parseSpec('kit: demo180\nsupply: 1.8\nstacks:\n  - {name: ota-load, device: p, topology: auto, current: 10u, rout: 100meg, headroom: 0.5, span: 1.5, objective: area}\n', 'load.yaml');
    const s = portSpec(spec, k180, k090).stacks[0];
    const margin = (r: number) => r / 100e6;
    expect(margin(s.to.predicted.rout)).toBeGreaterThan(margin(s.from.predicted.rout) * 0.95);
    expect(s.harder.filter((h) => h.quantity === 'rout')).toEqual([]);
  });

  it('a Rout margin that fell by more than that is harder, and the line shows two different margins', () => {
    const spec = parseSpec('kit: demo180\nsupply: 1.8\nstacks:\n  - {name: ota-load, device: p, topology: auto, current: 10u, rout: 100meg, headroom: 0.5, span: 1.5, objective: area}\n', 'load.yaml');
    const s = portSpec(spec, k180, k090).stacks[0];
    const from = { ...s.from, predicted: { ...s.from.predicted, rout: 150e6 } };
    const to = { ...s.to, predicted: { ...s.to.predicted, rout: 120e6 } };
    const item = harderTargets(spec.stacks[0], from, to).find((h) => h.quantity === 'rout');
    // Margin = predicted Rout / required Rout (common practice): 150/100 and 120/100.
    expect(item).toEqual({ quantity: 'rout', required: 100e6, from: 150e6, to: 120e6, fromMargin: 1.5, toMargin: 1.2 });
    expect(harderText(item!, false)).toBe('rout: margin 1.50x -> 1.20x of the target');
    const to2 = { ...s.to, predicted: { ...s.to.predicted, rout: 146e6 } }; // 2.7 % lower: within the search's 5 %
    expect(harderTargets(spec.stacks[0], from, to2).find((h) => h.quantity === 'rout')).toBeUndefined();
  });

  it('a headroom never reached is null in the data and JSON and "none" in text, never Infinity', () => {
    const spec = parseSpec('kit: demo180\nsupply: 1.8\nstacks:\n  - {name: ota-load, device: p, topology: auto, current: 10u, rout: 100meg, headroom: 0.5, span: 1.5, objective: area}\n', 'load.yaml');
    const s = portSpec(spec, k180, k090).stacks[0];
    const from = { ...s.from, predicted: { ...s.from.predicted, headroom: 0.3 } };
    const to = { ...s.to, feasible: false, predicted: { ...s.to.predicted, headroom: Infinity } };
    const list = harderTargets(spec.stacks[0], from, to);
    const head = list.find((h) => h.quantity === 'headroom');
    // Slack = headroom target − headroom provided (common practice): 0.5 − 0.3 = 0.2 V; none when never reached.
    expect(head).toMatchObject({ quantity: 'headroom', required: 0.5, from: 0.3, to: null, toSlack: null });
    expect(head && head.quantity === 'headroom' ? head.fromSlack : NaN).toBeCloseTo(0.2, 12);
    expect(harderText(head!, false)).toBe('headroom: slack 200 mV -> none');
    const json = toJson(list);
    expect(json).not.toMatch(/Infinity|NaN|undefined/);
    for (const h of JSON.parse(json) as Array<Record<string, unknown>>) {
      expect(typeof h.quantity).toBe('string');
      for (const v of Object.values(h)) if (typeof v === 'string') expect(v).not.toMatch(/ /); // names, not sentences
    }
    const text = list.map((h) => harderText(h, false)).join('; ');
    expect(text).not.toMatch(/Infinity|NaN|undefined/);
  });

  it('port JSON carries what got harder as objects, and the text still reads as sentences', () => {
    const spec = sink('200meg', 0.35, '10u', 1.0);
    const run = portSpec(spec, k180, k090);
    const json = JSON.parse(toJson(run.stacks)) as Array<{ harder: unknown[] }>;
    expect(json[0].harder.length).toBeGreaterThan(0);
    for (const h of json[0].harder) expect(typeof h).toBe('object');
    const text = renderPortText(run, { color: false });
    expect(text).not.toMatch(/Infinity|NaN|undefined/);
    const line = text.split('\n').find((l) => l.trim().startsWith('harder on demo090:'));
    expect(line).toBeDefined();
    expect(line).toContain('infeasible on the new kit');
  });
});
