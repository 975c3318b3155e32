import { scaleLinear, scaleLog, scaleSqrt, type ScaleLinear, type ScaleLogarithmic } from 'd3-scale';
import { line as d3line, symbol, symbolCircle, symbolDiamond, symbolSquare, symbolTriangle, type SymbolType } from 'd3-shape';
import { StackwrightError } from '../errors.js';
import { formatEng } from '../units/index.js';
import { colorAt, dashAt, INK } from './palette.js';
import { el, escapeXml, px, slug, text } from './svg.js';
import { linearTicks, logTicks, type ScaleKind, type Tick } from './ticks.js';

export interface AxisSpec {
  /** Quantity name, e.g. "Rout". */
  label: string;
  /** SI unit without prefix, e.g. "Ω"; "" for ratios. Shown in the title and on every tick. */
  unit: string;
  scale?: ScaleKind;
  /** Fixed domain; default: the data (and guides) extent, made nice. */
  domain?: [number, number];
  /** Tick count hint passed to d3 (default 6 on x, 5 on y). */
  ticks?: number;
  /** false: print tick values as plain numbers (units such as µm² that must not take a prefix). */
  si?: boolean;
  /** false: ticks without the unit (it is in the axis title), for units like 1/V that clutter. */
  tickUnit?: boolean;
  /** Linear axes only: stretch the default domain to include 0 (currents, areas). */
  zero?: boolean;
}

export interface XY {
  x: number;
  y: number;
}

export interface LineSeries {
  name: string;
  points: XY[];
  color?: string;
  dash?: string;
}

export interface ScatterPoint extends XY {
  /** Relative marker size (e.g. area); markers scale by sqrt so their area is proportional. */
  size?: number;
  /** Drawn with a heavy outline (e.g. the chosen design). */
  highlight?: boolean;
}

export interface ScatterSeries {
  name: string;
  points: ScatterPoint[];
  color?: string;
  /** Outline only (e.g. designs that miss a target), so they read apart from filled ones. */
  hollow?: boolean;
}

/** A dashed horizontal (axis 'y') or vertical (axis 'x') line with a label. */
export interface TargetLine {
  axis: 'x' | 'y';
  value: number;
  label: string;
  /** 'target' = a requirement (grey dashes); 'mark' = an achieved value (red dots). */
  kind?: 'target' | 'mark';
}

/** A shaded band; a missing side spans the whole plot. */
export interface Region {
  x?: [number, number];
  y?: [number, number];
  label?: string;
}

export interface LineChartOptions {
  /** Prefix of ids inside the SVG; must be unique when several charts share one page. */
  id?: string;
  title: string;
  subtitle?: string;
  x: AxisSpec;
  y: AxisSpec;
  series?: LineSeries[];
  scatter?: ScatterSeries[];
  targets?: TargetLine[];
  regions?: Region[];
  /** One line under the legend, e.g. "marker area ∝ device area". */
  note?: string;
  width?: number;
  height?: number;
}

export type AnyScale = ScaleLinear<number, number> | ScaleLogarithmic<number, number>;

export interface ChartBuild {
  svg: string;
  x: AnyScale;
  y: AnyScale;
  plot: { left: number; top: number; width: number; height: number };
  ticks: { x: Tick[]; y: Tick[] };
}

const FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, 'DejaVu Sans', sans-serif";
const SYMBOLS: SymbolType[] = [symbolCircle, symbolSquare, symbolTriangle, symbolDiamond];
const CHAR_W = 6.4; // average glyph width at 11 px, for layout only

/** Axis title with its unit: "Rout (Ω)", "gm/gds (V/V)" when unitless. */
export function axisTitle(axis: AxisSpec): string {
  return `${axis.label} (${axis.unit || 'V/V'})`;
}

function fail(title: string, message: string): never {
  throw new StackwrightError(message, { where: `chart "${title}"` });
}

function drawable(v: number, kind: ScaleKind): boolean {
  return Number.isFinite(v) && (kind === 'linear' || v > 0);
}

function makeScale(axis: AxisSpec, values: number[], range: [number, number], title: string, name: string): AnyScale {
  const kind = axis.scale ?? 'linear';
  let domain = axis.domain;
  if (domain) {
    const [a, b] = domain;
    if (!(Number.isFinite(a) && Number.isFinite(b) && a < b)) fail(title, `${name} domain must be two finite increasing numbers, got [${a}, ${b}]`);
    if (kind === 'log' && a <= 0) fail(title, `${name} domain of a log axis must be > 0, got [${a}, ${b}]`);
  } else {
    const ok = values.filter((v) => drawable(v, kind));
    if (axis.zero && kind === 'linear' && ok.length) ok.push(0);
    if (ok.length === 0) fail(title, `no ${name} values that can be drawn${kind === 'log' ? ' on a log axis (need values > 0)' : ''}`);
    let lo = Math.min(...ok);
    let hi = Math.max(...ok);
    if (lo === hi) {
      if (kind === 'log') [lo, hi] = [lo / 2, hi * 2];
      else [lo, hi] = [lo - (Math.abs(lo) * 0.1 || 1), hi + (Math.abs(hi) * 0.1 || 1)];
    }
    domain = [lo, hi];
  }
  const scale = kind === 'log' ? scaleLog().domain(domain).range(range) : scaleLinear().domain(domain).range(range);
  if (!axis.domain) scale.nice();
  return scale;
}

function inside(scale: AnyScale, v: number): boolean {
  const [a, b] = scale.domain();
  return v >= Math.min(a, b) && v <= Math.max(a, b);
}

function axisX(scale: AnyScale, ticks: Tick[], p: ChartBuild['plot'], spec: AxisSpec): string {
  const bottom = p.top + p.height;
  const parts: string[] = [];
  for (const t of ticks) {
    const x = scale(t.value);
    const major = t.label !== '';
    parts.push(
      el('g', { class: major ? 'tick' : 'tick minor', 'data-value': String(t.value) }, [
        el('line', { x1: x, x2: x, y1: p.top, y2: bottom, stroke: major ? INK.grid : INK.minorGrid }),
        el('line', { x1: x, x2: x, y1: bottom, y2: bottom + (major ? 5 : 3), stroke: INK.axis }),
        major ? text(t.label, { x, y: bottom + 17, 'text-anchor': 'middle' }) : '',
      ]),
    );
  }
  parts.push(el('line', { class: 'domain', x1: p.left, x2: p.left + p.width, y1: bottom, y2: bottom, stroke: INK.axis }));
  parts.push(text(axisTitle(spec), { class: 'axis-title', x: p.left + p.width / 2, y: bottom + 38, 'text-anchor': 'middle', 'font-size': 12, fill: INK.text }));
  return el('g', { class: 'axis axis-x', 'data-scale': spec.scale ?? 'linear', 'font-size': 11, fill: INK.muted }, parts);
}

function axisY(scale: AnyScale, ticks: Tick[], p: ChartBuild['plot'], spec: AxisSpec): string {
  const parts: string[] = [];
  for (const t of ticks) {
    const y = scale(t.value);
    const major = t.label !== '';
    parts.push(
      el('g', { class: major ? 'tick' : 'tick minor', 'data-value': String(t.value) }, [
        el('line', { x1: p.left, x2: p.left + p.width, y1: y, y2: y, stroke: major ? INK.grid : INK.minorGrid }),
        el('line', { x1: p.left - (major ? 5 : 3), x2: p.left, y1: y, y2: y, stroke: INK.axis }),
        major ? text(t.label, { x: p.left - 8, y: y + 4, 'text-anchor': 'end' }) : '',
      ]),
    );
  }
  parts.push(el('line', { class: 'domain', x1: p.left, x2: p.left, y1: p.top, y2: p.top + p.height, stroke: INK.axis }));
  const cx = 16;
  const cy = p.top + p.height / 2;
  parts.push(text(axisTitle(spec), { class: 'axis-title', x: cx, y: cy, 'text-anchor': 'middle', transform: `rotate(-90 ${px(cx)} ${px(cy)})`, 'font-size': 12, fill: INK.text }));
  return el('g', { class: 'axis axis-y', 'data-scale': spec.scale ?? 'linear', 'font-size': 11, fill: INK.muted }, parts);
}

/**
 * Lay out and draw a chart. Returns the SVG and the scales used, so callers
 * (and tests) can place extra marks or check positions.
 */
export function buildChart(opts: LineChartOptions): ChartBuild {
  const series = opts.series ?? [];
  const scatter = opts.scatter ?? [];
  const targets = opts.targets ?? [];
  const regions = opts.regions ?? [];
  if (series.length + scatter.length === 0) fail(opts.title, 'nothing to draw: no line or scatter series');
  const W = opts.width ?? 660;
  const H = opts.height ?? 400;
  const id = slug(opts.id ?? opts.title);

  const names = [...series.map((s) => s.name), ...scatter.map((s) => s.name), opts.note ?? ''];
  const longest = Math.max(...names.map((n) => [...n].length));
  const legendW = Math.min(210, 30 + longest * CHAR_W);
  const top = opts.subtitle ? 56 : 40;
  const plot = { left: 80, top, width: 0, height: H - top - 52 };

  const xs: number[] = [];
  const ys: number[] = [];
  for (const s of [...series, ...scatter]) for (const pt of s.points) {
    xs.push(pt.x);
    ys.push(pt.y);
  }
  for (const t of targets) (t.axis === 'x' ? xs : ys).push(t.value);

  const x = makeScale(opts.x, xs, [0, 1], opts.title, 'x');
  const y = makeScale(opts.y, ys, [plot.top + plot.height, plot.top], opts.title, 'y');
  const xKind = opts.x.scale ?? 'linear';
  const yKind = opts.y.scale ?? 'linear';
  const ticksOf = (scale: AnyScale, a: AxisSpec, n: number): Tick[] => {
    const ticks = (a.scale ?? 'linear') === 'log'
      ? logTicks(scale as ScaleLogarithmic<number, number>, a.ticks ?? n, a.unit, a.si ?? true)
      : linearTicks(scale as ScaleLinear<number, number>, a.ticks ?? n, a.unit, a.si ?? true);
    if (a.tickUnit !== false || !a.unit) return ticks;
    return ticks.map((t) => ({ ...t, label: t.label.endsWith(' ' + a.unit) ? t.label.slice(0, -a.unit.length - 1) : t.label }));
  };
  const xTicks = ticksOf(x, opts.x, 6);
  const yTicks = ticksOf(y, opts.y, 5);
  // The left margin follows the widest y label so the rotated axis title never overlaps it.
  const widest = Math.max(...yTicks.map((t) => [...t.label].length));
  plot.left = Math.round(Math.max(56, 36 + widest * CHAR_W));
  plot.width = W - plot.left - 18 - legendW;
  if (plot.width < 120 || plot.height < 80) fail(opts.title, `too small (${W}×${H}) for its legend; make it larger`);
  x.range([plot.left, plot.left + plot.width]);

  const body: string[] = [];
  body.push(el('rect', { x: 0, y: 0, width: W, height: H, fill: '#ffffff' }));
  body.push(text(opts.title, { class: 'chart-title', x: plot.left, y: 20, 'font-size': 14, 'font-weight': 600, fill: INK.text }));
  if (opts.subtitle) body.push(text(opts.subtitle, { class: 'chart-subtitle', x: plot.left, y: 38, 'font-size': 11, fill: INK.muted }));
  body.push(
    el('defs', {}, el('clipPath', { id: `${id}-clip` }, el('rect', { x: plot.left, y: plot.top, width: plot.width, height: plot.height }))),
  );

  const clip = `url(#${id}-clip)`;
  const shades = regions.map((r) => {
    const [x0, x1] = r.x ? [x(r.x[0]), x(r.x[1])] : [plot.left, plot.left + plot.width];
    const [y0, y1] = r.y ? [y(r.y[1]), y(r.y[0])] : [plot.top, plot.top + plot.height];
    const rx = Math.min(x0, x1);
    const ry = Math.min(y0, y1);
    return el('g', { class: 'region' }, [
      el('rect', { x: rx, y: ry, width: Math.abs(x1 - x0), height: Math.abs(y1 - y0), fill: INK.region, 'fill-opacity': 0.09 }),
      r.label ? text(r.label, { x: rx + 6, y: plot.top + plot.height - 8, 'font-size': 10, fill: INK.region }) : '',
    ]);
  });
  body.push(el('g', { class: 'regions', 'clip-path': clip }, shades));
  body.push(axisX(x, xTicks, plot, opts.x));
  body.push(axisY(y, yTicks, plot, opts.y));

  const lines = series.map((s, i) => {
    const gen = d3line<XY>()
      .defined((p) => drawable(p.x, xKind) && drawable(p.y, yKind))
      .x((p) => x(p.x))
      .y((p) => y(p.y))
      .digits(2);
    const d = gen(s.points);
    if (!d) fail(opts.title, `series "${s.name}" has no points that can be drawn`);
    return el('path', {
      class: 'series', 'data-series': s.name, d, fill: 'none', stroke: s.color ?? colorAt(i), 'stroke-width': 2,
      'stroke-dasharray': s.dash ?? dashAt(i), 'stroke-linejoin': 'round', 'stroke-linecap': 'round',
    });
  });
  body.push(el('g', { class: 'lines', 'clip-path': clip }, lines));

  const sizes = scatter.flatMap((s) => s.points.map((p) => p.size ?? 0)).filter((v) => Number.isFinite(v) && v > 0);
  const radius = scaleSqrt().domain([0, Math.max(...sizes, 1e-300)]).range([0, 9]);
  const dots = scatter.map((s, i) => {
    const color = s.color ?? colorAt(series.length + i);
    const shape = SYMBOLS[i % SYMBOLS.length];
    const marks = s.points
      .filter((p) => drawable(p.x, xKind) && drawable(p.y, yKind))
      .map((p) => {
        const r = sizes.length ? Math.max(2.5, radius(p.size ?? 0)) : 4;
        const d = symbol(shape, Math.PI * r * r).digits(2)();
        return el('path', {
          class: p.highlight ? 'point highlight' : 'point', d, transform: `translate(${px(x(p.x))} ${px(y(p.y))})`,
          ...(s.hollow
            ? { fill: '#ffffff', 'fill-opacity': 0.9, stroke: p.highlight ? INK.text : color, 'stroke-width': p.highlight ? 2 : 1.4 }
            : { fill: color, 'fill-opacity': 0.8, stroke: p.highlight ? INK.text : '#ffffff', 'stroke-width': p.highlight ? 2 : 0.8 }),
        });
      });
    if (marks.length === 0) fail(opts.title, `scatter series "${s.name}" has no points that can be drawn`);
    return el('g', { class: 'series scatter', 'data-series': s.name }, marks);
  });
  body.push(el('g', { class: 'points', 'clip-path': clip }, dots));

  const off: string[] = [];
  let vIndex = 0;
  const guides = targets.map((t) => {
    const scale = t.axis === 'x' ? x : y;
    if (!inside(scale, t.value)) {
      off.push(t.label);
      return '';
    }
    const mark = t.kind === 'mark';
    const style = { stroke: mark ? INK.mark : INK.target, 'stroke-width': mark ? 1.6 : 1.3, 'stroke-dasharray': mark ? '2 3' : '6 4' };
    const color = mark ? INK.mark : INK.target;
    const at = scale(t.value);
    if (t.axis === 'y') {
      const below = at < plot.top + 16;
      return el('g', { class: 'target', 'data-kind': t.kind ?? 'target' }, [
        el('line', { class: 'target-line', 'data-axis': 'y', 'data-value': String(t.value), x1: plot.left, x2: plot.left + plot.width, y1: at, y2: at, ...style }),
        text(t.label, { x: plot.left + plot.width - 4, y: below ? at + 13 : at - 5, 'text-anchor': 'end', 'font-size': 10.5, fill: color, 'paint-order': 'stroke', stroke: '#ffffff', 'stroke-width': 3 }),
      ]);
    }
    const row = vIndex++;
    const right = at > plot.left + plot.width * 0.62;
    return el('g', { class: 'target', 'data-kind': t.kind ?? 'target' }, [
      el('line', { class: 'target-line', 'data-axis': 'x', 'data-value': String(t.value), x1: at, x2: at, y1: plot.top, y2: plot.top + plot.height, ...style }),
      text(t.label, {
        x: right ? at - 4 : at + 4, y: plot.top + 12 + row * 14, 'text-anchor': right ? 'end' : 'start', 'font-size': 10.5, fill: color,
        'paint-order': 'stroke', stroke: '#ffffff', 'stroke-width': 3,
      }),
    ]);
  });
  body.push(el('g', { class: 'targets' }, guides));
  if (off.length) body.push(text(`off scale: ${off.join('; ')}`, { class: 'off-scale', x: W - 8, y: 20, 'text-anchor': 'end', 'font-size': 10, fill: INK.mark }));

  const lx = plot.left + plot.width + 18;
  const row = (i: number): string => `translate(${px(lx)} ${px(plot.top + 8 + i * 18)})`;
  const items = [
    ...series.map((s, i) => el('g', { class: 'legend-item', transform: row(i) }, [
      el('line', { x1: 0, x2: 20, y1: 0, y2: 0, stroke: s.color ?? colorAt(i), 'stroke-width': 2.5, 'stroke-dasharray': s.dash ?? dashAt(i) }),
      text(s.name, { x: 26, y: 4 }),
    ])),
    ...scatter.map((s, i) => el('g', { class: 'legend-item', transform: row(series.length + i) }, [
      el('path', {
        d: symbol(SYMBOLS[i % SYMBOLS.length], 50).digits(2)(), transform: 'translate(10 0)',
        ...(s.hollow
          ? { fill: '#ffffff', stroke: s.color ?? colorAt(series.length + i), 'stroke-width': 1.4 }
          : { fill: s.color ?? colorAt(series.length + i), 'fill-opacity': 0.8 }),
      }),
      text(s.name, { x: 26, y: 4 }),
    ])),
  ];
  const noteY = plot.top + 8 + items.length * 18 + 8;
  body.push(el('g', { class: 'legend', 'font-size': 11, fill: INK.text }, [
    ...items,
    opts.note ? text(opts.note, { class: 'legend-note', x: lx, y: noteY, 'font-size': 10, fill: INK.muted }) : '',
  ]));

  const svg = el('svg', {
    xmlns: 'http://www.w3.org/2000/svg', class: 'chart', id, viewBox: `0 0 ${W} ${H}`, width: W, height: H,
    role: 'img', 'aria-labelledby': `${id}-title`, 'font-family': FONT,
  }, [el('title', { id: `${id}-title` }, escapeXml(opts.subtitle ? `${opts.title} — ${opts.subtitle}` : opts.title)), ...body]);
  return { svg, x, y, plot, ticks: { x: xTicks, y: yTicks } };
}


/** A standalone SVG string (valid as a file of its own and inline in HTML). */
export function lineChart(opts: LineChartOptions): string {
  return buildChart(opts).svg;
}

/** Label of a target value: "Rout target 50 MΩ". */
export function targetLabel(what: string, value: number, unit: string): string {
  return `${what} ${formatEng(value, unit)}`;
}
