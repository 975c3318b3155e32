/**
 * Rendering of size --spice results for gain stages (text and HTML) from
 * hand-made stage confirmations on the demo spec's sized stage. Project rule
 * (COMMON.md, README): no NaN, Infinity or undefined reaches text or a
 * report; a swing end never reached reads "—".
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseSpec, sizeSpec } from '../src/index.js';
import { decidingStages } from '../src/solve/stage-choose.js';
import type { StageResult } from '../src/solve/stage-types.js';
import type { SizeResult } from '../src/solve/types.js';
import type { DesignSpec } from '../src/design/types.js';
import { htmlReport, renderConfirmText, missWords } from '../src/report/index.js';
import type { StageConfirmation, StageSimulatedFigures } from '../src/confirm/index.js';
import { ensureDemoTables, REPO, demoKit } from './helpers/cli.js';

let result: SizeResult;
let spec: DesignSpec;
let source: string;
let stage: StageResult;

beforeAll(() => {
  ensureDemoTables();
  const file = join(REPO, 'demo-tables', 'specs', 'marsh-wren.yaml');
  source = readFileSync(file, 'utf8');
  spec = parseSpec(source, file);
  result = sizeSpec(spec, demoKit('demo180')).result;
  stage = decidingStages(result)[0];
}, 120_000);

function figures(corner: string, scale: number, swing: boolean): StageSimulatedFigures {
  const p = stage.predicted;
  return {
    corner, gain: p.gain * scale, vin: p.vin + 0.002, vlow: swing ? p.vlow! + 0.01 : null, vhigh: swing ? p.vhigh! - 0.01 : null,
    swing: swing ? p.swing - 0.02 : 0, gbw: null, response: [], curve: stage.curve.map((c) => ({ vout: c.vout, vin: c.vin, gain: c.gain * scale })),
  };
}

describe('size --spice rendering of gain stages', () => {
  it('text: gain, swing ends and input voltage predicted beside simulated; corrected widths; misses in words', () => {
    const ok: StageConfirmation = {
      name: stage.name, simulated: { ...figures('tt', 0.9, true), corners: [figures('tt', 0.9, true)] }, confirmed: true, rounds: 2, misses: [],
      corrected: {
        input: { devices: stage.input.devices.map((d) => ({ role: d.role, w: d.w, l: d.l })), bias: stage.input.bias },
        load: { devices: stage.load.devices.map((d, k) => ({ role: d.role, w: k === stage.load.devices.length - 1 ? d.w * 1.5 : d.w, l: d.l })), bias: stage.load.bias },
        area: stage.predicted.area * 1.1,
      },
    };
    const text = renderConfirmText([], result, spec, { color: false }, [ok]);
    expect(text).toContain(`stage ${stage.name}: confirmed in simulation after correction (2 simulated rounds)`);
    expect(text).toMatch(/gain at the design point +≥ 1500 at 900 mV +\d+ +\d+/);
    expect(text).toMatch(/load top +[\d.]+ [µn]m +[\d.]+ [µn]m +\+50 %/);
    expect(text).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('a stage that misses: the verdict names the target, the needed and the simulated value; no swing ends reads "—"', () => {
    const miss = { target: 'gain' as const, required: 1500, achieved: 812.4, at: 0.9, device: null, corner: 'tt' };
    const bad: StageConfirmation = { name: stage.name, simulated: { ...figures('tt', 0.1, false), corners: [figures('tt', 0.1, false)] }, confirmed: false, rounds: 4, misses: [miss] };
    expect(missWords(miss)).toBe('gain at tt: needs ≥ 1500 at 900 mV, simulated 812.4');
    expect(missWords({ ...miss, target: 'swing', required: 1, achieved: 0.85 })).toBe('swing at tt: needs ≥ 1 V with the gain target held, simulated 850 mV');
    const text = renderConfirmText([], result, spec, { color: false }, [bad]);
    expect(text).toContain('NOT confirmed in simulation after 4 simulated rounds: gain at tt: needs ≥ 1500 at 900 mV, simulated 812.4');
    expect(text).toMatch(/vlow +[\d.]+ mV +—/);
    expect(text).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('HTML: the stage section carries the simulation block with the simulated gain curve over the predicted one', () => {
    const c: StageConfirmation = { name: stage.name, simulated: { ...figures('tt', 0.9, true), corners: [figures('tt', 0.9, true)] }, confirmed: true, rounds: 1, misses: [] };
    const html = htmlReport({ spec: { parsed: spec, source }, size: result, generatedBy: 'test', stageConfirmations: [c] });
    expect(html).toContain(`${stage.name}: confirmed in simulation?`);
    const charts = (html.match(/<svg[\s\S]*?<\/svg>/g) ?? []).filter((svg) => svg.includes('simulated over predicted'));
    expect(charts).toHaveLength(1);
    expect((charts[0].match(/<path[^>]*class="series/g) ?? []).length).toBeGreaterThanOrEqual(2);
    expect(html).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('a gbw target: GBW predicted beside simulated at every corner in text and HTML; a missed or unmeasured GBW in words', () => {
    // A copy of the run with a gbw target on the stage and a table prediction for it (hand-made figures).
    const withGbw: DesignSpec = { ...spec, stages: spec.stages!.map((s) => (s.name === stage.name ? { ...s, gbw: 20e6, cap: 1e-12 } : s)) };
    const run = structuredClone(result);
    const st = decidingStages(run).find((s) => s.name === stage.name)!;
    st.predicted.gbw = 31.4e6;
    for (const k of st.corners ?? []) if (k.corner === 'tt') k.predicted.gbw = 31.4e6;
    const sim = (corner: string, gbw: number | null) => ({ ...figures(corner, 0.9, true), gbw });
    const miss = { target: 'gbw' as const, required: 20e6, achieved: 12.5e6, at: 0.9, device: null, corner: 'tt' };
    const c: StageConfirmation = { name: stage.name, simulated: { ...sim('tt', 12.5e6), corners: [sim('tt', 12.5e6), sim('ss', null)] }, confirmed: false, rounds: 1, misses: [miss] };
    expect(missWords(miss)).toBe('GBW at tt: needs ≥ 20 MHz (unity-gain frequency with the load cap), simulated 12.5 MHz');
    expect(missWords({ ...miss, achieved: null })).toBe('GBW at tt: needs ≥ 20 MHz (unity-gain frequency with the load cap), simulated no fall to unity gain below 1 THz');
    const text = renderConfirmText([], run, withGbw, { color: false }, [c]);
    expect(text).toMatch(/GBW \(unity-gain frequency\) +≥ 20 MHz with 1 pF +31\.4 MHz +12\.5 MHz +— +—/);
    expect(text).toContain('NOT confirmed in simulation after 1 simulated round: GBW at tt: needs ≥ 20 MHz');
    expect(text).not.toMatch(/NaN|Infinity|undefined/);
    const html = htmlReport({ spec: { parsed: withGbw, source }, size: run, generatedBy: 'test', stageConfirmations: [c] });
    expect(html).toMatch(/GBW \(unity-gain frequency\)<\/t[dh]>/);
    expect(html).toContain('12.5 MHz');
    expect(html).not.toMatch(/NaN|Infinity|undefined/);
    // Without a gbw target there is no GBW row.
    expect(renderConfirmText([], result, spec, { color: false }, [{ ...c, misses: [] }])).not.toContain('GBW (unity-gain frequency)');
    // No response in the confirmation, no frequency chart.
    expect(html).not.toContain('Open-loop gain against frequency');
  });

  it('a gbw target with a simulated response: the HTML draws it over the single-pole response the tables predict', () => {
    const withGbw: DesignSpec = { ...spec, stages: spec.stages!.map((s) => (s.name === stage.name ? { ...s, gbw: 20e6, cap: 1e-12 } : s)) };
    const run = structuredClone(result);
    const st = decidingStages(run).find((s) => s.name === stage.name)!;
    st.predicted.gbw = 31.4e6;
    // A hand-made single-pole response: A0 = 2000, unity gain near 12.5 MHz, 20 points a decade from 1 Hz to 1 THz.
    const response = Array.from({ length: 241 }, (_, k) => {
      const f = 10 ** (k / 20);
      return { f, gain: 2000 / Math.sqrt(1 + (f / 6250) ** 2) };
    });
    const sim = { ...figures('tt', 0.9, true), gbw: 12.5e6, response };
    const c: StageConfirmation = { name: stage.name, simulated: { ...sim, corners: [sim] }, confirmed: false, rounds: 1, misses: [] };
    const html = htmlReport({ spec: { parsed: withGbw, source }, size: run, generatedBy: 'test', stageConfirmations: [c] });
    const charts = (html.match(/<svg[\s\S]*?<\/svg>/g) ?? []).filter((svg) => svg.includes('Open-loop gain against frequency'));
    expect(charts).toHaveLength(1);
    // The predicted single-pole curve and the simulated one, the GBW target and the simulated GBW marked.
    expect((charts[0].match(/<path[^>]*class="series/g) ?? []).length).toBe(2);
    expect(charts[0]).toContain('GBW target 20 MHz');
    expect(charts[0]).toContain('simulated GBW 12.5 MHz');
    expect(charts[0]).toContain('with 1 pF on the output');
    expect(html).not.toMatch(/NaN|Infinity|undefined/);
  });
});
