/**
 * The files `size` can write (front CSV and charts, netlist, HTML report). Loaded
 * only when one is asked for, so a plain `size` never loads the chart code.
 */
import { basename, extname } from 'node:path';
import { decidingResults, type Kit, type SizeRun } from '../../api.js';
import type { DesignSpec } from '../../spec/types.js';
import { stackCharts, htmlReport, type FrontPoint as ReportFront, type DesignCurves } from '../../report/index.js';
import { designCurves, defaultVds } from '../../device/index.js';
import { designNetlist } from '../../spice/netlist.js';
import type { Polarity } from '../../table/types.js';
import type { FrontPoint } from '../../solve/pareto.js';
import { packageVersion } from '../io.js';

export interface SizeOutputFlags {
  front?: string;
  netlist?: string;
  report?: string;
}

/** Pareto points as the report layer draws them. */
export function reportFront(points: FrontPoint[]): ReportFront[] {
  return points.map((p) => ({ headroom: p.headroom, rout: p.rout, area: p.area, topology: p.topology, l: p.devices.map((d) => d.l) }));
}

/** Pareto fronts as CSV, one row per point, SI units. */
export function frontCsv(fronts: Record<string, FrontPoint[]>): string {
  const lines = ['stack,topology,feasible,headroom_V,rout_ohm,area_m2,l_m,gmid_per_V,w_m,vds_setpoints_V'];
  const list = (xs: number[]): string => xs.map((x) => Number(x.toPrecision(6))).join(';');
  for (const [stack, points] of Object.entries(fronts)) {
    for (const p of points) {
      lines.push(
        [stack, p.topology, p.feasible, p.headroom, p.rout, p.area, list(p.devices.map((d) => d.l)), list(p.devices.map((d) => d.gmid)),
          list(p.devices.map((d) => d.w)), list(p.setpoints)]
          .map((v) => (typeof v === 'number' ? (Number.isFinite(v) ? Number(v.toPrecision(6)) : '') : v))
          .join(','),
      );
    }
  }
  return lines.join('\n') + '\n';
}

/** Design curves of each polarity the result uses, at the nominal corner. */
export function curvesFor(kit: Kit, run: SizeRun): DesignCurves[] {
  const devices = [...new Set(run.result.stacks.map((s) => s.device))] as Polarity[];
  const corner = run.result.corners[0];
  return devices.map((device) => {
    const table = kit.table(device, corner);
    const vds = defaultVds(table);
    return { kit: kit.kit, device, corner, vds, vsb: 0, curves: designCurves(table, { vds, vsb: 0 }) };
  });
}

export function reportHtml(spec: DesignSpec, source: string, kit: Kit, run: SizeRun, extraNotes: string[] = []): string {
  const note = kit.table(run.result.stacks[0]?.device ?? 'n', run.result.corners[0]).meta.note;
  return htmlReport({
    spec: { parsed: spec, source },
    size: run.result,
    fronts: Object.entries(run.fronts).map(([stack, points]) => ({ stack, points: reportFront(points) })),
    designCurves: curvesFor(kit, run),
    generatedBy: `stackwright ${packageVersion()}`,
    notes: [...(note ? [`kit ${kit.kit}: ${note}`] : []), ...extraNotes],
  });
}

/** Every requested output as [path, contents], built before anything is written. */
export function sizeOutputs(f: SizeOutputFlags, spec: DesignSpec, specPath: string, source: string, kit: Kit, run: SizeRun, notes: string[] = []): Array<[string, string]> {
  const files: Array<[string, string]> = [];
  if (f.front) {
    files.push([f.front, frontCsv(run.fronts)]);
    const stem = f.front.slice(0, f.front.length - extname(f.front).length);
    for (const s of spec.stacks) {
      const result = decidingResults(run.result).find((r) => r.name === s.name);
      const points = run.fronts[s.name] ?? [];
      if (!result || points.length === 0) continue;
      const charts = stackCharts(result, s, reportFront(points));
      if (charts.pareto) files.push([`${stem}.${s.name}.svg`, charts.pareto]);
    }
  }
  if (f.netlist) {
    const chosen = { ...run.result, stacks: decidingResults(run.result) };
    files.push([f.netlist, designNetlist(chosen, { supply: spec.supply, specs: spec.stacks, title: `stackwright ${basename(specPath)}` })]);
  }
  if (f.report) files.push([f.report, reportHtml(spec, source, kit, run, notes)]);
  return files;
}
