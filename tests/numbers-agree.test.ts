import { beforeAll, describe, expect, it } from 'vitest';
import { parseSpec } from '../src/design/index.js';
import { sizeSpec, type Kit } from '../src/index.js';
import { htmlReport, renderSizeBrief, renderSizeText, stageVerdictText, verdictText } from '../src/report/index.js';
import type { SizeResult, StackResult } from '../src/solve/types.js';
import type { Verdict } from '../src/solve/evaluate/verdict.js';
import type { StageVerdict } from '../src/solve/stage-types.js';
import { demoKits } from './helpers/cli.js';
import { exhaustive } from './helpers/exhaustive.js';

// One figure, one number: a designer reads a stack's verdict, its per-corner rows, the brief table and the HTML
// report side by side, and a figure or a verdict that differs between them is a contradiction whatever the cause.
// These tests run the invented demo kits (demo180, demo090) and compare the places against each other and against
// the definitions the README gives (a stack is feasible when every target holds at every corner; headroom is reported
// rounded up to the whole mV everywhere; the output current within 1 % of its target, common practice).

let kits: Record<'demo180' | 'demo090', Kit>;
beforeAll(() => {
  ({ kits } = demoKits());
});

function size(yaml: string): { result: SizeResult; text: string; brief: string; html: string } {
  const spec = parseSpec(yaml, 'spec.yaml');
  const { result } = sizeSpec(spec, kits[spec.kit as 'demo180' | 'demo090']);
  const text = renderSizeText(result, { color: false });
  const brief = renderSizeBrief(result, { color: false });
  const html = htmlReport({ spec: { parsed: spec, source: yaml }, size: result, generatedBy: 'test' });
  return { result, text, brief, html };
}

// SI prefixes as the report prints them (upper-case M is mega there, unlike in SPICE input).
const PREFIX: Record<string, number> = { E: 1e18, P: 1e15, T: 1e12, G: 1e9, M: 1e6, k: 1e3, '': 1, m: 1e-3, µ: 1e-6, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18 };

/** A printed figure such as "99.997 MΩ" or "1.096 V" back in SI units. */
function si(text: string, unit: string): number {
  const m = new RegExp(`^(-?[\\d.]+(?:e[-+]?\\d+)?)(?: ([EPTGMkmµnpfa]?)${unit})?$`).exec(text.trim());
  if (!m) throw new Error(`not a figure in ${unit}: ${JSON.stringify(text)}`);
  return Number(m[1]) * PREFIX[m[2] ?? ''];
}

/** The two figures of a comparison sentence "... A < B ..." or "... A ≥ B ...", parsed back to SI. */
function compared(sentence: string, unit: string): [number, number] {
  const num = `(-?[\\d.]+(?:e[-+]?\\d+)?(?: [EPTGMkmµnpfa]?${unit})?)`;
  const m = new RegExp(`${num} (?:<|≥|≤|>) (?:VDSsat |the )?${num}`).exec(sentence);
  if (!m) throw new Error(`no comparison in ${JSON.stringify(sentence)}`);
  return [si(m[1], unit), si(m[2], unit)];
}

describe('a stack verdict and its corner rows', () => {
  it('an INFEASIBLE summary never stands over corner rows that all meet the targets (demo090 p-type triple, span 0.6 V)', () => {
    // Here the search's own candidates all left a lower device out of saturation, and the nearest-point scan found a
    // design meeting every target; it was shown with its corner row "yes" under the summary "INFEASIBLE", binding
    // "saturation: bottom VDS 122 mV ≥ VDSsat 109 mV" (a binding that reads as met).
    const { result, text, brief } = size(`kit: demo090
corner: tt
supply: 1.2
stacks:
  - {name: small-span, device: p, topology: triple, current: 5u, rout: 100meg, headroom: 0.3, span: 0.6}
`);
    const s = result.stacks[0];
    const corners = s.corners ?? [];
    expect(corners.length).toBe(1);
    // The summary verdict is the conjunction of the corner verdicts (README: feasible = every target at every corner).
    expect(s.feasible).toBe(corners.every((c) => c.feasible));
    if (s.feasible) {
      // A feasible stack's figures meet the targets by the README's definitions: Rout ≥ target over the span,
      // headroom ≤ target, the current within 1 % (common practice), every lower device at VDS ≥ VDSsat
      // (saturation, EKV interpolation, Enz & Vittoz 2006).
      expect(s.predicted.rout).toBeGreaterThanOrEqual(100e6);
      expect(s.predicted.headroom).toBeLessThanOrEqual(0.3);
      expect(Math.abs(s.predicted.iout / 5e-6 - 1)).toBeLessThanOrEqual(0.01);
      for (const d of s.devices.slice(0, -1)) expect(d.vds).toBeGreaterThanOrEqual(d.vdsat!);
      expect(s.binding).toBeUndefined();
    } else {
      // A binding verdict reads as a miss.
      expect(s.binding?.target === 'saturation' ? s.binding.achieved! < s.binding.required! : true).toBe(true);
    }
    // The text header, the corner row and the brief row say the same.
    expect(text).toContain(`stack small-span: p-type triple — ${s.feasible ? 'FEASIBLE' : 'INFEASIBLE'}`);
    expect(text).toMatch(new RegExp(`\\n\\s+tt\\s+${s.feasible ? 'yes' : 'NO'}\\s`));
    expect(brief).toMatch(new RegExp(`small-span\\s+p-type triple\\s+${s.feasible ? 'feasible' : 'INFEASIBLE'}`));
  });
});

describe('a stack summary and its corner row name one target', () => {
  it('the corner row of an infeasible stack names the summary\'s binding target, with the same figures (demo180 n single, 500 MΩ)', () => {
    // One device cannot reach 500 MΩ (ro = 1/gds of a 2 µm device is about 1 MΩ at 40 µA here; common practice: a single
    // device's Rout is its ro). The summary said "rout 996 kΩ < 500 MΩ at 0.300 V" while its tt row said "headroom never
    // met > 0.300 V": two targets named for one miss.
    const { result, text } = size(`kit: demo180
corner: tt
supply: 1.8
stacks:
  - {name: rout-huge, device: n, topology: single, current: 40u, rout: 500meg, headroom: 0.3, span: 1.6}
`);
    const s = result.stacks[0];
    expect(s.feasible).toBe(false);
    const b = s.binding!;
    expect(b.target).toBe('rout');
    const row = s.corners!.find((c) => c.corner === b.corner)!;
    expect(row.feasible).toBe(false);
    expect(row.binding?.target).toBe(b.target);
    expect(verdictText(row.binding!)).toBe(verdictText(b));
    expect(text).toContain(`binding / tightest: ${verdictText(b)}`);
    // The figure is the shown design's own Rout at the headroom target: the lowest of its curve over [headroom, span].
    const over = s.curve.filter((p) => p.v >= 0.3 - 1e-9 && p.v <= 1.6 + 1e-9).map((p) => p.rout);
    expect(Math.abs(Math.min(...over) / b.achieved! - 1)).toBeLessThan(0.02);
  });

  it('an Iout miss says where it is measured, so it does not read as the mid-span Iout beside it (demo180 p single, all corners)', () => {
    // Rout 3 MΩ is within one device's reach, but its current leaves the 1 % window (common practice for a source's
    // compliance) before the span end: the summary quoted 10.2 µA beside a predicted mid-span Iout of 10 µA.
    const { result } = size(`kit: demo180
corner: all
supply: 1.8
stacks:
  - {name: ff-iout, device: p, topology: single, current: 10u, rout: 3meg, headroom: 0.3, span: 1.5}
`);
    const s = result.stacks[0];
    expect(s.feasible).toBe(false);
    const b = s.binding!;
    expect(b.target).toBe('iout');
    expect(b.at).not.toBeNull();
    expect(verdictText(b)).toContain(`at ${b.at!.toFixed(3)} V`);
    // The current it quotes is the curve's at that stack voltage.
    const p = s.curve.reduce((a, c) => (Math.abs(c.v - b.at!) < Math.abs(a.v - b.at!) ? c : a));
    expect(Math.abs(p.iout / b.achieved! - 1)).toBeLessThan(1e-3);
  });
});

describe('a width limit that binds', () => {
  it('shows the narrowest design meeting Rout and headroom, whose widest device is the figure the verdict and the corner row quote (demo180 p cascode, 1 mA, wmax 10 µm)', () => {
    // 1 mA through one device at most 10 µm wide needs a current density no table point reaches at that bias, so
    // every design meeting 5 MΩ and 0.5 V is wider, and no design within the limit is usable at all (the exhaustive
    // reference of tests/helpers/exhaustive.ts finds none; with 30 µm it finds one at 3.3 kΩ, and then that one is
    // shown, as the README says). The summary said "at least 3.43 mm" while the design
    // shown had an 8.83 mm device and its corner row said "every design ... at least 8.83 mm": three widths for one limit.
    const { result, text } = size(`kit: demo180
corner: tt
supply: 1.8
stacks:
  - {name: wide-p, device: p, topology: cascode, current: 1m, rout: 5meg, headroom: 0.5, span: 1.5, wmax: 10u}
`);
    const s = result.stacks[0];
    expect(s.feasible).toBe(false);
    // No usable design within the limit: nothing reaches the headroom target's Rout.
    expect(s.nearest?.routAtHeadroom).toBe(0);
    const b = s.binding!;
    expect(b.target).toBe('width');
    const widest = Math.max(...s.devices.map((d) => d.w));
    expect(Math.abs(widest / b.achieved! - 1)).toBeLessThan(1e-9);
    // It is a design meeting Rout and headroom (README definitions), only too wide.
    expect(s.predicted.rout).toBeGreaterThanOrEqual(5e6);
    expect(s.predicted.headroom).toBeLessThanOrEqual(0.5);
    const row = s.corners![0];
    expect(row.binding?.target).toBe('width');
    expect(row.binding?.achieved).toBeCloseTo(b.achieved!, 12);
    // The row speaks of its one design, not of every design.
    expect(verdictText(row.binding!)).not.toContain('every design');
    expect(text).toContain(verdictText(row.binding!));
  });
});

describe('a gain stage with no design', () => {
  it('shows no figures of a design in the brief table, the HTML summary or the text, where the text says none was realised (demo090, output 0.22 V)', () => {
    // A cascoded n-input side needs two VDSsat (each at least about 4·UT, EKV interpolation, Enz & Vittoz 2006) plus
    // room for its input; with a cascoded p load on a 1.2 V supply and the output at 0.22 V no side design stays
    // saturated. The text said "design — (none realised)" while the brief table showed gain 0, swing 0 V, area 0 µm².
    const { result, text, brief, html } = size(`kit: demo090
corner: tt
supply: 1.2
stages:
  - {name: amp-sat, current: 10u, gain: 200, swing: 0.3, output: 0.22, input: {device: n, topology: cascode}, load: {topology: cascode}}
`);
    const s = result.stages![0];
    expect(s.feasible).toBe(false);
    expect(s.input.devices.length + s.load.devices.length).toBe(0);
    expect(text).toContain('— (none realised)');
    const row = brief.split('\n').find((l) => l.startsWith('amp-sat '))!;
    expect(row.split(/\s{2,}/).slice(3, 6)).toEqual(['—', '—', '—']);
    expect(brief).not.toMatch(/^stack\s+topology/m); // no empty stack table in a spec of stages only
    const summary = /<section id="stages">.*?<tbody>(.*?)<\/tbody>/s.exec(html)![1];
    expect(summary).not.toContain('0 µm²');
    expect(summary.match(/<td[^>]*>—( \(≥ [^<]*\))?<\/td>/g)?.length).toBe(3); // gain (target), swing (target), area
  });
});

describe('a stage swing that meets its target', () => {
  it('reads as met in the verdict of a feasible stage and of each corner row (demo180 n-cascode into p-cascode, [tt, ss, ff])', () => {
    // The ss swing came out vhigh − vlow = 1.5075 − 0.2875 = 1.2199999999999998 V in binary floating point: the stage
    // was feasible (its corner row "yes") while its tightest target read "swing at the gain target 1.22 V < 1.22 V
    // (−222 aV)". The swing is the width of an interval whose ends lie on a sub-mV grid (README, output swing).
    const { result, text } = size(`kit: demo180
corner: [tt, ss, ff]
supply: 1.8
stages:
  - {name: amp-ss, current: 10u, gain: 1500, swing: 1.22, output: 0.9, input: {device: n, topology: cascode}, load: {topology: cascode}}
`);
    const s = result.stages![0];
    expect(s.feasible).toBe(true);
    for (const c of s.corners ?? []) {
      expect(c.feasible).toBe(true);
      const t = c.tightest!;
      const words = stageVerdictText(t);
      expect(words, words).not.toMatch(/ < /);
      if (t.target === 'swing') {
        expect(t.achieved!).toBeGreaterThanOrEqual(t.required!);
        // The swing is its interval's width (the ends as reported).
        expect(Math.abs(c.predicted.swing - (c.predicted.vhigh! - c.predicted.vlow!))).toBeLessThan(1e-12);
      }
    }
    expect(text).not.toMatch(/swing at the gain target [\d.]+ m?V < /);
  });
});

describe('a comparison in a verdict reads as what it says', () => {
  it('a Rout just under its target is not printed as the target (demo090 p-type cascode, 82.7 MΩ at 0.29 V)', () => {
    // A binding Rout of 99.997 MΩ against 100 MΩ at 0.3 V once read "rout 100 MΩ < 100 MΩ" (since the search meets
    // that spec; here the best at 0.29 V is 82.65 MΩ). The sentence must show two numbers whose order is the one it
    // states, and the first must still round to the table's figure.
    const { result, text } = size(`kit: demo090
corner: tt
supply: 1.2
stacks:
  - {name: near, device: p, topology: cascode, current: 5u, rout: 82.7meg, headroom: 0.29, span: 0.6}
`);
    const s: StackResult = result.stacks[0];
    expect(s.feasible).toBe(false);
    const b = s.binding!;
    const words = verdictText(b);
    expect(text).toContain(words);
    expect(b.target).toBe('rout');
    // Within a rounding of the table's three significant figures of each other: the case the sentence must keep apart.
    expect(b.required! / b.achieved!).toBeLessThan(1.005);
    const [got, need] = compared(words, 'Ω');
    expect(got < need).toBe(b.achieved! < b.required!);
    expect(got).not.toBe(need);
  });

  it('every verdict kind keeps two different figures apart, and equal ones as they are', () => {
    // Constructed verdicts a hair either side of their targets: the printed order must be the true order.
    const v = (target: Verdict['target'], required: number, achieved: number): Verdict => ({ target, required, achieved, at: 0.3, device: target === 'saturation' ? 'bottom' : null, corner: 'tt' });
    const cases: Array<[Verdict, string]> = [
      [v('rout', 100e6, 99.997e6), 'Ω'], [v('rout', 100e6, 100.004e6), 'Ω'], [v('saturation', 0.1, 0.09996), 'V'], [v('width', 1.152e-3, 1.1516e-3), 'm'],
    ];
    for (const [verdict, unit] of cases) {
      const [got, need] = compared(verdictText(verdict), unit);
      expect(Math.sign(got - need), verdictText(verdict)).toBe(Math.sign(verdict.achieved! - verdict.required!));
    }
    expect(verdictText(v('rout', 50e6, 50e6))).toContain('50 MΩ ≥ 50 MΩ');
    // The current window is 1 % (README; common practice for a source's compliance): a miss just outside must not
    // read as exactly on it, a point inside keeps its two decimals.
    expect(verdictText(v('iout', 10e-6, 10.1004e-6))).toContain('is 1.004 % off');
    expect(verdictText(v('iout', 10e-6, 9.98e-6))).toContain('is -0.20 % off');
    const sv = (target: StageVerdict['target'], required: number, achieved: number): StageVerdict => ({ target, required, achieved, at: target === 'gain' ? 0.9 : null, device: null, corner: 'tt' });
    for (const [verdict, unit] of [[sv('gain', 1500, 1499.8), ''], [sv('swing', 0.9, 0.89996), 'V'], [sv('gbw', 10e6, 9.9996e6), 'Hz']] as const) {
      const [got, need] = compared(stageVerdictText(verdict), unit);
      expect(got < need, stageVerdictText(verdict)).toBe(true);
    }
    // One minus sign throughout: a swing miss gives its shortfall in V and in %, both with the ASCII sign the
    // figures themselves use (before, U+2212 beside '-').
    expect(stageVerdictText(sv('swing', 1.0, 0.95))).toContain('(-50 mV, -5.0 %)');
  });
});

describe('headroom is shown as its whole mV everywhere', () => {
  it('above 1 V too: text, per-corner rows, brief and HTML summary give the JSON value (demo180 stacked cascode, [tt, ss])', () => {
    // README: headroom is found to 1 mV and reported rounded up to the whole mV everywhere. Three significant digits
    // showed 1.096 V as "1.1 V" and 1.437 V as "1.44 V", numbers the JSON does not hold (and a value such as 1.434 V
    // would read 1.43 V, below what the design provides).
    const { result, text, brief, html } = size(`kit: demo180
corner: [tt, ss]
supply: 1.8
stacks:
  - {name: hv, device: p, topology: cascode-stacked, current: 30u, rout: 300meg, headroom: 1.1, span: 1.7}
`);
    const s = result.stacks[0];
    const all = [s.predicted.headroom, ...(s.corners ?? []).map((c) => c.predicted.headroom)];
    expect(all.some((h) => h >= 1 && Math.round(h * 100) !== h * 100)).toBe(true); // the case under test occurs
    for (const h of all) expect(Math.abs(h * 1000 - Math.round(h * 1000))).toBeLessThan(1e-6);
    // Every headroom cell of the text's predicted table and corner rows, the brief row and the HTML summary.
    const shown = (re: RegExp, src: string) => [...src.matchAll(re)].map((m) => si(m[1], 'V'));
    const predicted = shown(/\n\s+headroom\s+(\d[\d.]* m?V)\n/g, text);
    const rows = shown(/\n\s+(?:tt|ss)\s+(?:yes|NO)\s+\S+ \S+\s+\S+ \S+\s+(\d[\d.]* m?V)/g, text);
    const briefCell = shown(/\nhv\s+.*?\S+ \S+\s+(\d[\d.]* m?V)\s+\S+ µm²/g, brief);
    const htmlCell = shown(/<td class="num">(\d[\d.]* m?V) \(≤ /g, html);
    expect(predicted).toEqual([s.predicted.headroom].map((h) => expect.closeTo(h, 9)));
    expect(rows).toEqual(all.slice(1).map((h) => expect.closeTo(h, 9)));
    expect(briefCell).toEqual([expect.closeTo(s.predicted.headroom, 9)]);
    expect(htmlCell).toEqual([expect.closeTo(s.predicted.headroom, 9)]);
  });
});

describe('a report page names each result once', () => {
  it('every id on the HTML page is unique, with alternatives of a stack and loads of a stage each a section of their own (demo180, topology and load auto)', () => {
    // HTML Living Standard, "The id attribute": the value must be unique amongst the IDs in the element's tree.
    // Before, every alternative of a stack repeated the chosen design's section and chart ids.
    const { result, html } = size(`kit: demo180
corner: tt
supply: 1.8
stacks:
  - {name: tail, device: n, topology: auto, current: 20u, rout: 20meg, headroom: 0.4, span: 1.6}
stages:
  - {name: amp, current: 10u, gain: 300, swing: 0.8, output: 0.9, input: {device: n, topology: single}, load: {topology: auto}}
`);
    expect(result.stacks.filter((s) => s.chosen === false).length).toBeGreaterThan(0);
    expect((result.stages ?? []).filter((s) => s.chosen === false).length).toBeGreaterThan(0);
    const ids = [...html.matchAll(/\sid="([^"]*)"/g)].map((m) => m[1]);
    const repeated = ids.filter((id, k) => ids.indexOf(id) !== k);
    expect(repeated).toEqual([]);
    // One section per result: the chosen stack under its name, each alternative under its name and topology.
    const sections = [...html.matchAll(/<section class="stack" id="([^"]*)"/g)].map((m) => m[1]);
    expect(sections.length).toBe(result.stacks.length + (result.stages ?? []).length);
  });
});

describe('a stacked cascode with no room for its top device', () => {
  // Stacked diode bias (common practice): the bottom output device's VDS is its diode's VGS1, so at mid-span the top
  // device has v_mid − VGS1 of VDS and needs it positive to conduct in saturation at all. Both specs come from a
  // random-spec scan (seed 4242): a current too high for the width limit except at a high VGS.
  const cases = [
    { kit: 'demo180' as const, supply: 1.8, device: 'n' as const, current: 217e-6, headroom: 0.261, span: 1.213, wmax: 2.7e-6, line: 'current: 217u, rout: 13.1meg, headroom: 0.261, span: 1.213, objective: area, wmax: 2.7u' },
    { kit: 'demo090' as const, supply: 1.2, device: 'p' as const, current: 577e-6, headroom: 0.153, span: 0.649, wmax: 7.5e-6, line: 'current: 577u, rout: 735k, headroom: 0.153, span: 0.649, objective: rout, wmax: 7.5u' },
  ];
  it.each(cases)('binds on the top device\'s saturation with the same figures in JSON, text, brief and HTML, true against the tables by hand and the exhaustive reference ($kit $device, $current A, wmax $wmax m)', (c) => {
    const yaml = `kit: ${c.kit}
corner: tt
supply: ${c.supply}
stacks:
  - {name: tight, device: ${c.device}, topology: cascode-stacked, ${c.line}}
`;
    const { result, text, brief, html } = size(yaml);
    const s = result.stacks[0];
    expect(s.feasible).toBe(false);
    const b = s.binding!;
    expect(b.target).toBe('saturation');
    expect(b.device).toBe('top');
    const vmid = (c.headroom + c.span) / 2;
    expect(b.at).toBeCloseTo(vmid, 12);
    expect(b.achieved!).toBeLessThanOrEqual(0);
    const line = verdictText(b);
    expect(line).toContain('no room for the top device');
    expect(line).not.toContain('table');
    // The text wraps long explanations at 120 columns.
    const flat = (x: string) => x.replace(/\s+/g, ' ');
    expect(flat(text)).toContain(line);
    // The figures of the sentence are the JSON's: VGS = at − achieved, VDS = achieved, at mid-span.
    const vgs = `${(b.at! - b.achieved!).toFixed(3)} V`;
    expect(line).toContain(`VGS ≥ ${vgs}`);
    expect(line).toContain(`at mid-span ${b.at!.toFixed(3)} V`);
    for (const place of [html, brief]) {
      expect(flat(place)).toContain('no room for the top device');
      expect(place).toContain(vgs);
    }
    expect(JSON.stringify(result)).not.toMatch(/NaN|Infinity/);

    // Hand check on the table: every diode (VDS = VGS, VSB = 0, magnitudes) of every table length whose width I/jd
    // lies within [shortest length, wmax] and whose gm/ID lies within 3..30 /V (the README's allowed space) has
    // VGS ≥ v_mid.
    const kit = kits[c.kit];
    const lengths = Array.from(kit.lengths('tt', c.device));
    let lowest = Infinity;
    for (const l of lengths) {
      const slice = kit.slice('tt', c.device, l);
      for (let v = 0.2; v <= c.supply; v += 0.0005) {
        const [jd, gm] = slice.small(v, v, 0);
        if (!(jd > 0)) continue;
        const w = c.current / jd;
        const gmid = gm / jd;
        if (w >= lengths[0] && w <= c.wmax && gmid >= 3 && gmid <= 30) lowest = Math.min(lowest, v);
      }
    }
    expect(Number.isFinite(lowest)).toBe(true);
    expect(lowest).toBeGreaterThanOrEqual(vmid);
    // The lowest VGS the verdict quotes is the table's, within the 0.5 mV scan step.
    expect(Math.abs(b.at! - b.achieved! - lowest)).toBeLessThan(1e-3);
    // The exhaustive reference (tests/helpers/exhaustive.ts) finds no design in the allowed space at all.
    const spec = parseSpec(yaml, 'spec.yaml').stacks[0];
    const ref = exhaustive(spec, kit, 'cascode-stacked', 'tt', { gmidStep: 3, vStep: 0.05 });
    expect(ref.designs).toBe(0);
    expect(ref.best).toBeUndefined();
  });

  it('keeps binding on the table where the top device\'s source lies beyond the tables\' VSB axis (demo090 n, gm/ID 3..4)', () => {
    // Every allowed bottom diode leaves the top device room (VGS1 below v_mid = 0.96 V), but VGS1 is the top device's
    // VSB and lies above the 0.6 V end of the demo090 VSB axis: the tables, not the room, are what is missing.
    const { result, text } = size(`kit: demo090
corner: tt
supply: 1.2
stacks:
  - {name: deep, device: n, topology: cascode-stacked, current: 100u, rout: 100k, headroom: 0.72, span: 1.2, objective: area, gmid: {min: 3, max: 4}}
`);
    const s = result.stacks[0];
    expect(s.feasible).toBe(false);
    expect(s.binding?.target).toBe('table');
    expect(text).toContain(verdictText(s.binding!));
    // Hand check on the table: the lowest diode VGS at gm/ID ≤ 4 /V is above the VSB axis's end but below v_mid.
    const kit = kits.demo090;
    let lowest = Infinity;
    for (const l of Array.from(kit.lengths('tt', 'n'))) {
      const slice = kit.slice('tt', 'n', l);
      for (let vgs = 0.2; vgs <= 1.2; vgs += 0.0005) {
        const [jd, gm] = slice.small(vgs, vgs, 0);
        if (jd > 0 && gm / jd >= 3 && gm / jd <= 4) lowest = Math.min(lowest, vgs);
      }
    }
    expect(lowest).toBeGreaterThan(kit.slice('tt', 'n', kit.lengths('tt', 'n')[0]).range.vsb[1]);
    expect(lowest).toBeLessThan(0.96);
  });
});
