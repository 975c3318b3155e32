import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import {
  buildChart, designCharts, displayWidth, htmlReport, lineChart, renderSizeText, renderTable, stackCharts, stripAnsi,
  type LineChartOptions,
} from '../src/report/index.js';
import { formatEng } from '../src/units/index.js';
import { loadReportInput, loadSize } from './fixtures/report/load.js';

// ---------- a tiny XML well-formedness checker (XML 1.0 §2.1 "well-formed": one root, nested tags, quoted unique attributes, escaped & and <)
function xmlProblem(src: string): string | null {
  const stack: string[] = [];
  let i = 0;
  let roots = 0;
  const entity = /^&(?:amp|lt|gt|quot|apos|#\d+|#x[0-9a-fA-F]+);/;
  const checkText = (t: string): string | null => {
    for (let k = t.indexOf('&'); k >= 0; k = t.indexOf('&', k + 1)) if (!entity.test(t.slice(k))) return `bad entity at ${k}`;
    return null;
  };
  while (i < src.length) {
    const lt = src.indexOf('<', i);
    const chunk = lt < 0 ? src.slice(i) : src.slice(i, lt);
    const bad = checkText(chunk);
    if (bad) return bad;
    if (chunk.trim() !== '' && stack.length === 0) return 'text outside the root';
    if (lt < 0) break;
    if (src.startsWith('<!--', lt)) {
      const end = src.indexOf('-->', lt);
      if (end < 0) return 'unclosed comment';
      i = end + 3;
      continue;
    }
    if (src.startsWith('<?', lt)) {
      const end = src.indexOf('?>', lt);
      if (end < 0) return 'unclosed declaration';
      i = end + 2;
      continue;
    }
    const m = /^<(\/?)([A-Za-z_][\w.:-]*)((?:\s+[A-Za-z_][\w.:-]*\s*=\s*(?:"[^"<]*"|'[^'<]*'))*)\s*(\/?)>/.exec(src.slice(lt));
    if (!m) return `malformed tag at ${lt}: ${src.slice(lt, lt + 30)}`;
    const [all, close, name, attrText, self] = m;
    if (close) {
      if (stack.pop() !== name) return `mismatched </${name}> at ${lt}`;
    } else {
      const names = [...attrText.matchAll(/([A-Za-z_][\w.:-]*)\s*=/g)].map((a) => a[1]);
      if (new Set(names).size !== names.length) return `duplicate attribute in <${name}>`;
      for (const v of attrText.matchAll(/=\s*(?:"([^"]*)"|'([^']*)')/g)) {
        const bad2 = checkText(v[1] ?? v[2] ?? '');
        if (bad2) return `attribute of <${name}>: ${bad2}`;
      }
      if (stack.length === 0) roots++;
      if (!self) stack.push(name);
    }
    i = lt + all.length;
  }
  if (stack.length) return `unclosed <${stack[stack.length - 1]}>`;
  return roots === 1 ? null : `expected one root element, found ${roots}`;
}

// Python's expat parser (via xml.dom.minidom) as an outside reference; null = parsed fine.
function expatProblem(src: string): string | null {
  const r = spawnSync('python3', ['-c', 'import sys, xml.dom.minidom; xml.dom.minidom.parseString(sys.stdin.buffer.read())'], { input: src });
  if (r.error) throw r.error;
  return r.status === 0 ? null : r.stderr.toString().trim().split('\n').pop() ?? 'error';
}

/** m·10^k for m = 1..9 inside [lo, hi], ascending (log graph paper), built without any scale library. */
function handLogTicks(lo: number, hi: number): number[] {
  const out: number[] = [];
  for (let k = Math.floor(Math.log10(lo)); k <= Math.ceil(Math.log10(hi)); k++) {
    for (let m = 1; m <= 9; m++) {
      const v = Number(`${m}e${k}`);
      if (v >= lo && v <= hi) out.push(v);
    }
  }
  return out;
}

const attr = (tag: string, name: string): string | undefined => new RegExp(`\\s${name}="([^"]*)"`).exec(tag)?.[1];
const tags = (svg: string, re: RegExp): string[] => [...svg.matchAll(re)].map((m) => m[0]);
const group = (svg: string, cls: string): string => {
  const start = svg.indexOf(`<g class="${cls}"`);
  expect(start, `group ${cls}`).toBeGreaterThanOrEqual(0);
  // Axis groups contain no nested axis groups; the next "axis " group or the lines group ends it.
  const end = svg.indexOf('<g class="', svg.indexOf('class="domain"', start));
  return svg.slice(start, end < 0 ? undefined : end);
};

const routChart: LineChartOptions = {
  id: 'rout-test',
  title: 'Rout <test> & "quotes"',
  subtitle: "it's escaped",
  x: { label: 'stack voltage', unit: 'V' },
  y: { label: 'Rout', unit: 'Ω', scale: 'log', domain: [2e5, 3e8], ticks: 5 },
  series: [
    { name: 'L = 0.18 µm', points: [{ x: 0.1, y: 3e5 }, { x: 0.4, y: 2e7 }, { x: 1.2, y: 1.5e8 }] },
    { name: 'L = 0.36 µm', points: [{ x: 0.1, y: 5e5 }, { x: 0.5, y: 6e7 }, { x: 1.2, y: 2.5e8 }] },
    { name: 'gap & skip', points: [{ x: 0.2, y: 1e6 }, { x: 0.25, y: 2e6 }, { x: 0.3, y: -1 }, { x: 0.6, y: 4e6 }, { x: 0.9, y: 9e6 }] },
  ],
  scatter: [{ name: 'candidates', points: [{ x: 0.5, y: 5e7, size: 2 }, { x: 0.7, y: 8e7, size: 8, highlight: true }] }],
  targets: [
    { axis: 'y', value: 50e6, label: 'Rout target 50 MΩ' },
    { axis: 'x', value: 0.45, label: 'headroom target 450 mV' },
    { axis: 'x', value: 0.42, label: 'this design', kind: 'mark' },
  ],
  regions: [{ x: [0.45, 1.2], label: 'targets hold' }],
};

describe('XML checker (self-test: it must be able to fail)', () => {
  it.each([
    ['<a><b></a></b>', /mismatched/],
    ['<a>x & y</a>', /entity/],
    ['<a t="1" t="2"/>', /duplicate/],
    ['<a t="<"/>', /malformed/],
    ['<a></a><b/>', /one root/],
    ['<a>', /unclosed/],
  ])('rejects %s', (src, why) => {
    expect(xmlProblem(src)).toMatch(why);
    expect(expatProblem(src)).not.toBeNull();
  });
  it('accepts a well-formed sample', () => {
    const ok = '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"><!-- c --><text x=\'1\'>a &amp; b &#181;</text><g/></svg>';
    expect(xmlProblem(ok)).toBeNull();
    expect(expatProblem(ok)).toBeNull();
  });
});

describe('lineChart', () => {
  const build = buildChart(routChart);
  const svg = build.svg;

  it('is well-formed XML with a viewBox, by our checker and by expat', () => {
    expect(xmlProblem(svg)).toBeNull();
    expect(expatProblem(svg)).toBeNull();
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"[^>]* viewBox="0 0 660 400"/);
    expect(svg).not.toMatch(/<test>|& "/);
    expect(svg).toContain('Rout &lt;test&gt; &amp; &quot;quotes&quot;');
    expect(svg).not.toMatch(/@import|url\(http|<link|href=/); // no network fonts or resources
  });

  it('draws every line series as a <path> with a non-empty d, and each scatter point as a path', () => {
    const lines = tags(svg, /<path class="series"[^>]*>/g);
    expect(lines.length).toBe(3);
    for (const p of lines) expect(attr(p, 'd')).toMatch(/^M[\d.]+,[\d.]+L/);
    // The non-positive point on the log axis breaks the line into two pieces (d3 line.defined).
    expect((attr(lines[2], 'd') ?? '').match(/M/g)?.length).toBe(2);
    const points = tags(svg, /<path class="point[^"]*"[^>]*>/g);
    expect(points.length).toBe(2);
    for (const p of points) expect(attr(p, 'd')?.length).toBeGreaterThan(5);
  });

  it('has one legend entry per series (lines + scatter)', () => {
    expect(tags(svg, /<g class="legend-item"/g).length).toBe(routChart.series!.length + routChart.scatter!.length);
  });

  it('axis titles carry units', () => {
    const titles = tags(svg, /<text class="axis-title"[^>]*>[^<]*<\/text>/g).map((t) => t.replace(/<[^>]+>/g, ''));
    expect(titles).toEqual(['stack voltage (V)', 'Rout (Ω)']);
  });

  it('log-axis ticks over a few decades are the 1–9 multiples of each decade inside the domain, decades labelled in SI', () => {
    const y = group(svg, 'axis axis-y');
    const values = tags(y, /<g class="tick[^"]*" data-value="[^"]*"/g).map((t) => Number(attr(t, 'data-value')));
    // By hand, as on log graph paper (common practice): m·10^k for m = 1..9 within [2e5, 3e8].
    const ref = handLogTicks(2e5, 3e8);
    expect(ref[0]).toBe(2e5);
    expect(ref[ref.length - 1]).toBe(3e8);
    expect(values.length).toBe(ref.length);
    values.forEach((v, i) => expect(v / ref[i]).toBeCloseTo(1, 12));
    // Every decade inside the domain gets a label (common practice on log axes); formatEng gives "1 MΩ".
    for (const [v, label] of [[1e6, '1 MΩ'], [1e7, '10 MΩ'], [1e8, '100 MΩ']] as const) {
      expect(formatEng(v, 'Ω')).toBe(label); // SI prefix M = 1e6 (BIPM SI brochure, table 7)
      expect(y).toContain(`>${label}</text>`);
    }
  });

  it('a log axis of five decades with a tick hint of 5 shows decades only (by hand)', () => {
    const b = buildChart({ ...routChart, y: { label: 'Rout', unit: 'Ω', scale: 'log', domain: [1e3, 1e8], ticks: 5 } });
    // Six decades already meet a hint of 5 ticks, so no in-between multiples (common practice).
    expect(b.ticks.y.map((t) => t.value)).toEqual([1e3, 1e4, 1e5, 1e6, 1e7, 1e8]);
    expect(b.ticks.y.map((t) => t.label)).toEqual(['1 kΩ', '10 kΩ', '100 kΩ', '1 MΩ', '10 MΩ', '100 MΩ']);
  });

  it('log ticks of a default (niced) domain round out to whole decades', () => {
    const b = buildChart({ ...routChart, y: { label: 'Rout', unit: 'Ω', scale: 'log', ticks: 5 } });
    // Rounding a log domain out to whole decades (common practice): [3e5, 2.5e8] -> [1e5, 1e9].
    expect(b.y.domain()).toEqual([1e5, 1e9]);
    const values = b.ticks.y.map((t) => t.value);
    const ref = handLogTicks(1e5, 1e9);
    expect(values.length).toBe(ref.length);
    values.forEach((v, i) => expect(v / ref[i]).toBeCloseTo(1, 12));
  });

  it('linear ticks are nice numbers, labelled with a shared prefix', () => {
    const x = group(svg, 'axis axis-x');
    const values = tags(x, /<g class="tick[^"]*" data-value="[^"]*"/g).map((t) => Number(attr(t, 'data-value')));
    // Heckbert, "Nice numbers for graph labels", Graphics Gems (1990): the step from {1, 2, 5}·10^k nearest
    // span/count = 1.1/6 ≈ 0.18 is 0.2; ticks are its multiples inside [0.1, 1.2].
    expect(values).toEqual([0.2, 0.4, 0.6, 0.8, 1, 1.2]);
    expect(x).toContain('>0.2 V</text>');
    expect(x).toContain('>1.2 V</text>');
    expect(x).not.toContain('mV');
  });

  it('target lines sit where the scale maps their value (checked against the log/linear scale definitions)', () => {
    const { plot } = build;
    const bottom = plot.top + plot.height;
    const [x0, x1] = build.x.domain();
    // Log scale: y = bottom - h·(log v - log lo)/(log hi - log lo); linear: x = left + w·(v - lo)/(hi - lo).
    const yLog = (v: number): number => bottom - (plot.height * (Math.log10(v) - Math.log10(2e5))) / (Math.log10(3e8) - Math.log10(2e5));
    const xLin = (v: number): number => plot.left + (plot.width * (v - x0)) / (x1 - x0);
    const lines = tags(svg, /<line class="target-line"[^>]*>/g);
    expect(lines.length).toBe(3);
    const h = lines.find((l) => attr(l, 'data-axis') === 'y')!;
    expect(Number(attr(h, 'y1'))).toBeCloseTo(yLog(50e6), 1);
    expect(Number(attr(h, 'y2'))).toBeCloseTo(yLog(50e6), 1);
    const v = lines.filter((l) => attr(l, 'data-axis') === 'x').map((l) => Number(attr(l, 'x1')));
    expect(v[0]).toBeCloseTo(xLin(0.45), 1);
    expect(v[1]).toBeCloseTo(xLin(0.42), 1);
    expect(svg).toContain('>Rout target 50 MΩ</text>');
    expect(svg).toContain('stroke-dasharray="6 4"');
    // The shaded region spans the headroom target to the end of the span.
    const rect = tags(svg, /<g class="region"><rect[^>]*>/g)[0];
    expect(Number(attr(rect, 'x'))).toBeCloseTo(xLin(0.45), 1);
    expect(Number(attr(rect, 'width'))).toBeCloseTo(xLin(1.2) - xLin(0.45), 1);
  });

  it('puts an off-domain target in a note instead of drawing it outside the plot', () => {
    const s = lineChart({ ...routChart, targets: [{ axis: 'y', value: 1e9, label: 'Rout target 1 GΩ' }] });
    expect(tags(s, /<line class="target-line"/g).length).toBe(0);
    expect(s).toContain('off scale: Rout target 1 GΩ');
  });

  it('bad input throws a one-line StackwrightError naming the chart', () => {
    const cases: Array<[LineChartOptions, RegExp]> = [
      [{ ...routChart, series: [], scatter: [] }, /nothing to draw/],
      [{ ...routChart, y: { label: 'Rout', unit: 'Ω', scale: 'log' }, series: [{ name: 'neg', points: [{ x: 1, y: -5 }, { x: 2, y: 0 }] }], scatter: [], targets: [] }, /log axis/],
      [{ ...routChart, y: { label: 'Rout', unit: 'Ω', scale: 'log', domain: [0, 1e6] } }, /log axis must be > 0/],
      [{ ...routChart, x: { label: 'v', unit: 'V', domain: [1, 1] } }, /finite increasing/],
      [{ ...routChart, series: [{ name: 'nan', points: [{ x: NaN, y: 1e6 }] }], scatter: [] }, /series "nan"/],
    ];
    for (const [opts, why] of cases) {
      let err: unknown;
      try {
        lineChart(opts);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(StackwrightError);
      expect((err as Error).message).toMatch(why);
      expect((err as Error).message).toMatch(/^chart "/);
      expect((err as Error).message).not.toContain('\n');
    }
  });
});

describe('design and stack charts from the invented fixtures', () => {
  const input = loadReportInput();

  it('design charts: three charts per device, one curve and legend entry per length, log y for ID/W and fT', () => {
    const dc = input.designCurves![0];
    const set = designCharts(dc);
    for (const svg of [set.gain, set.jd, set.ft!]) {
      expect(xmlProblem(svg)).toBeNull();
      expect(tags(svg, /<path class="series"/g).length).toBe(dc.curves.length);
      expect(tags(svg, /<g class="legend-item"/g).length).toBe(dc.curves.length);
      expect(svg).toContain('>L = 0.18 µm</text>');
      expect(svg).toContain('demo180 · n-type · tt');
      expect(svg).toContain('VDS = 900 mV, VSB = 0 V');
      expect(svg).toContain('>gm/ID (1/V)</text>');
    }
    expect(set.gain).toContain('>gm/gds (V/V)</text>');
    expect(set.jd).toContain('>ID/W (A/m)</text>');
    expect(set.ft).toContain('>fT (Hz)</text>');
    expect(group(set.jd, 'axis axis-y')).toContain('data-scale="log"');
    expect(group(set.ft!, 'axis axis-y')).toContain('data-scale="log"');
    const noFt = designCharts({ ...dc, curves: dc.curves.map((c) => ({ ...c, points: c.points.map(({ ft: _ft, ...p }) => p) })) });
    expect(noFt.ft).toBeUndefined();
  });

  it('stack charts: Rout target, headroom target and achieved headroom drawn; Pareto front present', () => {
    const stack = input.size.stacks[0];
    const spec = input.spec.parsed.stacks[0];
    const set = stackCharts(stack, spec, input.fronts![0].points);
    expect(set.rout).toContain('>Rout target 50 MΩ</text>');
    expect(set.rout).toContain('>headroom target 450 mV</text>');
    expect(set.rout).toContain(`>this design ${formatEng(stack.predicted.headroom, 'V')}</text>`);
    expect(tags(set.rout!, /<line class="target-line"/g).length).toBe(3);
    expect(set.iout).toContain('>Iout (A)</text>');
    expect(set.pareto).toBeDefined();
    // Front points: one marker per candidate, plus the chosen design.
    expect(tags(set.pareto!, /<path class="point/g).length).toBe(input.fronts![0].points.length + 1);
    expect(set.area).toContain('>area W·L (µm²)</text>');
    for (const s of [set.rout!, set.iout!, set.pareto!, set.area!]) expect(expatProblem(s)).toBeNull();
  });
});

describe('text tables', () => {
  it('renderTable pads every line to the same width with columns aligned', () => {
    const headers = ['device', 'W', 'Rout'];
    const rows = [['bottom', '6.5 µm', '51.5 MΩ'], ['top', '9 µm', '1.2 GΩ'], ['bias-long-name', '10 µm', '—']];
    const out = renderTable(headers, rows, { align: ['left', 'right', 'right'] }).split('\n');
    // Widths counted by hand: column 1 = 14 ("bias-long-name"), 2 = 6 ("6.5 µm"), 3 = 7 ("51.5 MΩ"), gaps of 2.
    const expected = 14 + 2 + 6 + 2 + 7;
    expect(out.length).toBe(2 + rows.length);
    for (const line of out) expect(displayWidth(line)).toBe(expected);
    expect(out[2]).toBe('bottom          6.5 µm  51.5 MΩ');
    expect(out[3]).toBe('top               9 µm   1.2 GΩ');
    expect(out[1]).toBe('─'.repeat(14) + '  ' + '─'.repeat(6) + '  ' + '─'.repeat(7));
  });

  it('counts µ and Ω as one column each (single code points, narrow in common practice), not UTF-16 units', () => {
    expect(displayWidth('51.5 MΩ')).toBe(7);
    expect(displayWidth('\u001b[1mab\u001b[22m')).toBe(2);
  });

  it('colour only when asked; with colour the text under the SGR codes is identical', () => {
    const plain = renderTable(['a', 'b'], [['x', '1']], { color: false });
    const colored = renderTable(['a', 'b'], [['x', '1']], { color: true });
    expect(plain).not.toContain('\u001b[');
    expect(colored).toContain('\u001b[1m');
    expect(stripAnsi(colored)).toBe(plain);
  });

  it('rejects a row of the wrong length', () => {
    expect(() => renderTable(['a', 'b'], [['x']])).toThrow(/row 1 has 1 cells, the header has 2/);
  });

  it('renderSizeText shows devices, bias, predictions, the square-law comparison and corners, aligned', () => {
    const size = loadSize();
    const text = renderSizeText(size, { color: false });
    expect(text).not.toContain('\u001b[');
    // The caution is wrapped to 120 columns (meant to change): compare with whitespace collapsed.
    expect(text.replace(/\s+/g, " ")).toContain(`CAUTION: ${size.caution}`);
    expect(text).toContain('stack tail_sink: n-type cascode — FEASIBLE');
    expect(text).toContain('stack load_source: p-type cascode-stacked — INFEASIBLE');
    // Status lines wrap at 120 columns (meant to change): match with whitespace collapsed.
    expect(text.replace(/\s+/g, " ")).toMatch(/the Rout target needs 0\.780 V of headroom at best/);
    // Square law gm/ID = 2/Vov (common practice, strong-inversion relation): gm/ID 11.8 /V -> Vov 169 mV.
    expect(text).toMatch(/Vov bottom \(table: 2\/\(gm\/ID\)\)\s+169 mV\s+171 mV/);
    expect(text).toMatch(/bottom\s+6\.5 µm\s+720 nm\s+612 mV/);
    // Every table block: all its lines have one width.
    let tables = 0;
    for (const b of text.split(/\n\n/)) {
      const lines = b.split('\n').filter((l) => l !== '');
      const rule = lines.findIndex((l) => l.trimStart().startsWith('─'));
      if (rule < 1) continue;
      // Explanations printed under a row (indented further, meant to change: 120-column limit) are not table lines.
      const table = lines.slice(rule - 1).filter((l) => !/^ {6}\S/.test(l));
      const w = displayWidth(table[0]);
      for (const l of table) expect(displayWidth(l)).toBe(w);
      tables++;
    }
    expect(tables).toBe(2 * 5); // devices, bias, predicted, square law, corners per stack
    expect(renderSizeText(size, { color: true })).toContain('\u001b[32mFEASIBLE');
  });
});

describe('htmlReport', () => {
  const input = loadReportInput();
  const html = htmlReport(input);

  it('is one self-contained page: inline CSS and SVG, no scripts, no external resources', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).not.toMatch(/<script|<link|<img|@import|src=/i);
    // The only URL is the SVG namespace name, which is never fetched (Namespaces in XML 1.0).
    expect(html.replace(/xmlns="http:\/\/www\.w3\.org\/2000\/svg"/g, '')).not.toMatch(/https?:\/\//);
  });

  it('puts the caution first, before the summary and any stack', () => {
    const caution = html.indexOf('class="caution"');
    expect(caution).toBeGreaterThan(0);
    expect(caution).toBeLessThan(html.indexOf('id="summary"'));
    expect(caution).toBeLessThan(html.indexOf('class="stack"'));
    expect(html).toContain(input.size.caution.replace(/'/g, '&apos;'));
  });

  it('holds the spec source, every chart, and each SVG parses as XML', () => {
    expect(html).toContain('rout: 50meg');
    const svgs = [...html.matchAll(/<svg[\s\S]*?<\/svg>/g)].map((m) => m[0]);
    expect(svgs.length).toBe(2 * 4 + 2 * 3);
    const ids = svgs.map((s) => attr(s, 'id'));
    expect(new Set(ids).size).toBe(ids.length); // clip-path ids must not collide on one page
    for (const s of svgs) expect(xmlProblem(s)).toBeNull();
    expect(html).toContain('lookup table against square law');
    expect(html).toContain('per corner');
    expect(html).toContain('invented demonstration data');
  });
});
