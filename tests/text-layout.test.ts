import { beforeAll, describe, expect, it } from 'vitest';
import { loadKit, sizeSpec, type SizeRun } from '../src/api.js';
import { parseSpec } from '../src/design/index.js';
import { renderSizeBrief, renderSizeText } from '../src/report/size-text.js';
import { reportHtml } from '../src/report/size-outputs.js';
import { displayWidth } from '../src/report/text.js';
import { demoKit, ensureDemoTables } from './helpers/cli.js';

// A stack the objective sizes with a few alternatives, one of them infeasible with a long explanation.
const SPEC = `kit: demo180
supply: 1.8
stacks:
  - name: load
    device: p
    topology: auto
    current: 10u
    rout: 100meg
    headroom: 0.5
    span: 1.5
  - name: tight
    device: n
    topology: auto
    current: 2m
    rout: 10k
    headroom: 0.02
    span: 0.27
`;

const widest = (text: string): number => Math.max(...text.split('\n').map(displayWidth));

describe('text output layout', () => {
  let run: SizeRun;
  let kit: ReturnType<typeof loadKit>;
  beforeAll(() => {
    ensureDemoTables();
    kit = demoKit('demo180');
    run = sizeSpec(parseSpec(SPEC, 's.yaml'), kit);
  });

  // 120 columns: a common terminal width the issue sets as the limit.
  it('text and --brief fit 120 columns; explanations go on their own line under the row', () => {
    const text = renderSizeText(run.result, { color: false });
    const brief = renderSizeBrief(run.result, { color: false });
    expect(widest(text)).toBeLessThanOrEqual(120);
    expect(widest(brief)).toBeLessThanOrEqual(120);
    expect(brief).toMatch(/\n {4}binding: rout /); // the infeasible stack's reason, under its row
    expect(text).toMatch(/\n {6,}why: /);
  });

  it('shows the chosen topology first and marked in text', () => {
    const text = renderSizeText(run.result, { color: false });
    const lines = text.split('topologies tried (auto)')[1].split('\n');
    const start = lines.findIndex((l) => l.includes('───')) + 1;
    const end = lines.findIndex((l, i) => i >= start && l.trim() === '');
    const block = lines.slice(start, end < 0 ? undefined : end).filter((l) => !/why:/.test(l));
    expect(block[0]).toMatch(/^ {2}▸ \S+\s+chosen\b/);
    expect(block.slice(1).every((l) => !l.includes('▸'))).toBe(true);
    // On a colour terminal the chosen row is bold as well (ECMA-48 SGR 1).
    expect(renderSizeText(run.result, { color: true })).toMatch(/\u001b\[1m {2}▸ /);
  });

  it('the report lists the chosen design first, highlighted, and marks alternatives far above it in area', () => {
    const result = structuredClone(run.result);
    const chosen = result.stacks.find((s) => s.name === 'load' && s.chosen === true)!;
    const alt = result.stacks.find((s) => s.name === 'load' && s.chosen === false)!;
    alt.predicted.area = chosen.predicted.area * 12;
    const html = reportHtml(parseSpec(SPEC, 's.yaml'), SPEC, kit, { result, fronts: run.fronts }, 'test');
    const rows = [...html.matchAll(/<tr( class="chosen")?><td>load<\/td><td>([^<]+)<\/td>/g)];
    expect(rows[0][1]).toBe(' class="chosen"');
    expect(rows[0][2]).toBe(`${chosen.topology} (chosen)`);
    expect(rows.slice(1).every((r) => r[1] === undefined)).toBe(true);
    expect(html).toContain('area 12× the chosen');
    const text = renderSizeText(result, { color: false });
    expect(text).toContain('area 12× the chosen');
  });
});
