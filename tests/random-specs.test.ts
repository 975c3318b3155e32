import { join } from 'node:path';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadKit, sizeSpec, type Kit } from '../src/api.js';
import { renderSizeBrief, renderSizeText } from '../src/report/size-text.js';
import { sizeFiles } from '../src/cli/commands/size-files.js';
import { toJson } from '../src/cli/io.js';
import { StackwrightError } from '../src/errors.js';
import { parseSpec } from '../src/design/index.js';
import { ensureDemoTables, REPO } from './helpers/cli.js';

/**
 * Random specs on the demo kits, sized end to end: every text, JSON, CSV, netlist
 * and report the CLI would print or write must be free of NaN, Infinity and
 * undefined (COMMON.md: none ever reaches a user), and a refusal must be a
 * one-line StackwrightError. Sizing is slow, so few runs with a fixed seed
 * (FC_SEED=random for a fresh draw).
 */
const seedEnv = process.env.FC_SEED;
const RUNS = { numRuns: 40, ...(seedEnv === 'random' ? {} : { seed: seedEnv ? Number(seedEnv) : 20261203 }) };
const BAD = /NaN|Infinity|undefined/;

const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => Number((10 ** e).toPrecision(3)));

const KITS = { demo180: 1.8, demo090: 1.2 } as const;

const stackArb = (supply: number, i: number) =>
  fc.record({
    device: fc.constantFrom('n', 'p'),
    topology: fc.constantFrom('auto', 'single', 'cascode', 'cascode-stacked', 'triple'),
    current: logUniform(1e-7, 2e-3),
    rout: logUniform(1e4, 1e10),
    spanShare: fc.double({ min: 0.3, max: 1, noNaN: true }),
    headShare: fc.double({ min: 0.05, max: 0.9, noNaN: true }),
    objective: fc.constantFrom('area', 'headroom', 'rout'),
    mismatch: fc.option(fc.constantFrom('0.2%', '1%', '5%'), { nil: undefined }),
    l: fc.option(fc.tuple(logUniform(0.02e-6, 1e-6), logUniform(0.5e-6, 20e-6)), { nil: undefined }),
  }).map((s) => {
    const span = Number((supply * s.spanShare).toFixed(3));
    const headroom = Number(Math.max(0.02, span * s.headShare).toFixed(3));
    const lines = [
      `  - name: s${i}`, `    device: ${s.device}`, `    topology: ${s.topology}`, `    current: ${s.current}`, `    rout: ${s.rout}`,
      `    headroom: ${headroom}`, `    span: ${span}`, `    objective: ${s.objective}`,
    ];
    if (s.mismatch) lines.push(`    mismatch: ${s.mismatch}`);
    if (s.l) lines.push(`    l: [${Math.min(...s.l)}, ${Math.max(...s.l)}]`);
    return lines.join('\n');
  });

/** A gain stage (issue 11: a spec with stages is covered by the same checks). */
const stageArb = (supply: number, i: number) =>
  fc.record({
    current: logUniform(1e-7, 2e-3),
    gain: logUniform(3, 1e5),
    swingShare: fc.double({ min: 0.05, max: 0.9, noNaN: true }),
    outputShare: fc.option(fc.double({ min: 0.2, max: 0.8, noNaN: true }), { nil: undefined }),
    device: fc.constantFrom('n', 'p'),
    input: fc.constantFrom('single', 'cascode'),
    load: fc.constantFrom('auto', 'single', 'cascode', 'cascode-stacked', 'triple'),
    objective: fc.constantFrom('area', 'swing', 'gain'),
    gbw: fc.option(fc.tuple(logUniform(1e5, 1e9), logUniform(1e-14, 1e-11)), { nil: undefined }),
    l: fc.option(fc.tuple(logUniform(0.02e-6, 1e-6), logUniform(0.5e-6, 20e-6)), { nil: undefined }),
  }).map((s) => {
    const lines = [
      `  - name: g${i}`, `    current: ${s.current}`, `    gain: ${s.gain}`, `    swing: ${Number((supply * s.swingShare).toFixed(3))}`,
      `    input: {device: ${s.device}, topology: ${s.input}${s.l ? `, l: [${Math.min(...s.l)}, ${Math.max(...s.l)}]` : ''}}`,
      `    load: {topology: ${s.load}}`, `    objective: ${s.objective}`,
    ];
    if (s.gbw) lines.push(`    gbw: ${s.gbw[0]}`, `    cap: ${s.gbw[1]}`);
    if (s.outputShare !== undefined) lines.push(`    output: ${Number((supply * s.outputShare).toFixed(3))}`);
    return lines.join('\n');
  });

const specArb = fc.constantFrom(...(Object.keys(KITS) as Array<keyof typeof KITS>)).chain((kit) =>
  fc.tuple(fc.constant(kit), fc.double({ min: 0.5, max: 1.15, noNaN: true }), fc.integer({ min: 0, max: 2 }), fc.integer({ min: 0, max: 1 })).chain(([k, share, n, m]) => {
    const supply = Number((KITS[k] * share).toFixed(2));
    // At least one stack or stage; a spec with only stages is drawn too.
    const stacks = Math.max(n, m === 0 ? 1 : 0);
    return fc.tuple(fc.tuple(...Array.from({ length: stacks }, (_, i) => stackArb(supply, i))), fc.tuple(...Array.from({ length: m }, (_, i) => stageArb(supply, i)))).map(
      ([st, sg]) => `kit: ${k}\nsupply: ${supply}\nstacks:${st.length ? `\n${st.join('\n')}` : ' []'}\n${sg.length ? `stages:\n${sg.join('\n')}\n` : ''}`,
    );
  }),
);

describe('random specs on the demo kits', () => {
  const kits: Record<string, Kit> = {};
  beforeAll(() => {
    ensureDemoTables();
    for (const k of Object.keys(KITS)) kits[k] = loadKit(k, { tables: join(REPO, 'tables') });
  });

  it('never print or write NaN, Infinity or undefined; refusals are one line', () => {
    let sized = 0;
    let stagesSized = 0;
    fc.assert(
      fc.property(specArb, (text) => {
        const spec = parseSpec(text, 'random.yaml');
        let run;
        try {
          run = sizeSpec(spec, kits[spec.kit]);
        } catch (e) {
          if (!(e instanceof StackwrightError)) throw e;
          expect(e.message).not.toMatch(/\n/);
          expect(e.message).not.toMatch(BAD);
          return;
        }
        sized++;
        if (spec.stages?.length) stagesSized++;
        const stageGains = Object.fromEntries((spec.stages ?? []).map((st) => [st.name, st.gain]));
        const outputs: Array<[string, string]> = [
          ['text', renderSizeText(run.result, { color: false, stageFronts: run.stageFronts, stageGains })],
          ['brief', renderSizeBrief(run.result, { color: false, stageFronts: run.stageFronts, stageGains })],
          ['json', toJson({ ...run.result, fronts: run.fronts, ...(run.stageFronts ? { stageFronts: run.stageFronts } : {}) })],
          ...sizeFiles({ front: 'f.csv', netlist: 'n.cir', report: 'r.html' }, spec, 'random.yaml', text, kits[spec.kit], run),
        ];
        for (const [what, body] of outputs) {
          const hit = BAD.exec(body);
          expect(hit ? `${what}: …${body.slice(Math.max(0, hit.index - 80), hit.index + 20)}…` : '').toBe('');
        }
      }),
      RUNS,
    );
    // The draw must size something, or the property says nothing about outputs.
    expect(sized).toBeGreaterThan(3);
    expect(stagesSized).toBeGreaterThan(1);
  }, 600_000);
});
