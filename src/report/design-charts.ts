import { StackwrightError } from '../errors.js';
import { formatEng } from '../units/index.js';
import { lineChart, type LineSeries, type XY } from './chart.js';
import { formatMicrons, polarityName } from './format.js';
import { slug } from './svg.js';
import type { DesignCurves } from './types.js';
import type { DesignPoint } from '../device/curves.js';

export interface DesignChartSet {
  gain: string;
  jd: string;
  /** Absent when the table has no capacitances. */
  ft?: string;
}

/** "demo180 · n-type · tt" and "VDS = 0.9 V, VSB = 0 V". */
export function designTitle(dc: DesignCurves): { title: string; subtitle: string } {
  return {
    title: `${dc.kit} · ${polarityName(dc.device)} · ${dc.corner}`,
    subtitle: `VDS = ${formatEng(dc.vds, 'V')}, VSB = ${formatEng(dc.vsb, 'V')}, one curve per channel length`,
  };
}

function seriesOf(dc: DesignCurves, pick: (p: DesignPoint) => number | undefined): LineSeries[] {
  return dc.curves.map((c) => ({
    name: `L = ${formatMicrons(c.l)}`,
    // Sorted by VGS so each curve is traced the way the device moves through inversion.
    points: [...c.points].sort((a, b) => a.vgs - b.vgs).map((p): XY => ({ x: p.gmid, y: pick(p) ?? NaN })),
  }));
}

/**
 * The three sizing charts of one device: gm/gds, ID/W (log) and fT (log) against gm/ID.
 */
export function designCharts(dc: DesignCurves, idPrefix = ''): DesignChartSet {
  if (dc.curves.length === 0) throw new StackwrightError('no lengths to plot', { where: `design curves ${dc.kit}/${dc.device}/${dc.corner}` });
  const { title, subtitle } = designTitle(dc);
  const base = slug(`${idPrefix}${dc.kit}-${dc.device}-${dc.corner}`);
  const x = { label: 'gm/ID', unit: '1/V', tickUnit: false };
  const gain = lineChart({
    id: `${base}-gain`, title: `Intrinsic gain — ${title}`, subtitle, x,
    y: { label: 'gm/gds', unit: '' }, series: seriesOf(dc, (p) => p.gain),
  });
  const jd = lineChart({
    id: `${base}-jd`, title: `Current density — ${title}`, subtitle, x,
    y: { label: 'ID/W', unit: 'A/m', scale: 'log' }, series: seriesOf(dc, (p) => p.jd),
  });
  const hasFt = dc.curves.some((c) => c.points.some((p) => p.ft !== undefined && Number.isFinite(p.ft) && p.ft > 0));
  const ft = hasFt
    ? lineChart({
        id: `${base}-ft`, title: `Transit frequency — ${title}`, subtitle, x,
        y: { label: 'fT', unit: 'Hz', scale: 'log' }, series: seriesOf(dc, (p) => p.ft),
      })
    : undefined;
  return { gain, jd, ft };
}
