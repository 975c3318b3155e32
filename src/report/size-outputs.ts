import type { DesignSpec } from '../design/types.js';
import type { DeviceTable, Polarity } from '../table/types.js';
import type { FrontPoint } from '../solve/pareto.js';
import type { SizeResult } from '../solve/types.js';
import type { StageFrontPoint } from '../solve/stage-types.js';
import { decidingResults } from '../solve/choose.js';
import { designCurves, defaultVds } from '../device/index.js';
import { stackCharts } from './stack-charts.js';
import { htmlReport } from './html.js';
import type { DesignCurves } from './types.js';
import type { StageConfirmation } from '../confirm/stage-types.js';
import type { Confirmation } from '../confirm/types.js';

/** Where the report reads a kit's tables from (a loaded Kit fits). */
export interface TableSource {
  kit: string;
  table(device: Polarity, corner: string): DeviceTable;
}

/** A size run as the outputs need it: the result and the Pareto front per stack name. */
interface Run {
  result: SizeResult;
  fronts: Record<string, FrontPoint[]>;
  stageFronts?: Record<string, StageFrontPoint[]>;
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

/** One Pareto chart (SVG) per stack that has a front, keyed by stack name. */
export function frontCharts(spec: DesignSpec, run: Run): Array<[string, string]> {
  const out: Array<[string, string]> = [];
  for (const s of spec.stacks) {
    const result = decidingResults(run.result).find((r) => r.name === s.name);
    const points = run.fronts[s.name] ?? [];
    if (!result || points.length === 0) continue;
    const charts = stackCharts(result, s, points);
    if (charts.pareto) out.push([s.name, charts.pareto]);
  }
  return out;
}

/** Design curves of each polarity the result uses, at the nominal corner. */
export function curvesFor(kit: TableSource, result: SizeResult): DesignCurves[] {
  const devices = [...new Set([...result.stacks.map((s) => s.device), ...(result.stages ?? []).flatMap((s) => [s.input.device, s.load.device])])] as Polarity[];
  const corner = result.corners[0];
  return devices.map((device) => {
    const table = kit.table(device, corner);
    const vds = defaultVds(table);
    return { kit: kit.kit, device, corner, vds, vsb: 0, curves: designCurves(table, { vds, vsb: 0 }) };
  });
}

/** The self-contained HTML report of a size run, with the kit's note (demo kits say they are invented). */
export function reportHtml(spec: DesignSpec, source: string, kit: TableSource, run: Run, generatedBy: string, extraNotes: readonly string[] = [], confirmations?: Confirmation[], stageConfirmations?: StageConfirmation[]): string {
  const note = kit.table(run.result.stacks[0]?.device ?? run.result.stages?.[0]?.input.device ?? 'n', run.result.corners[0]).meta.note;
  return htmlReport({
    spec: { parsed: spec, source },
    size: run.result,
    fronts: Object.entries(run.fronts).map(([stack, points]) => ({ stack, points })),
    stageFronts: Object.entries(run.stageFronts ?? {}).map(([stage, points]) => ({ stage, points })),
    designCurves: curvesFor(kit, run.result),
    generatedBy,
    notes: [...(note ? [`kit ${kit.kit}: ${note}`] : []), ...extraNotes],
    confirmations,
    stageConfirmations,
  });
}
