import { basename, extname } from 'node:path';
import type { Command } from 'commander';
import { loadKit, sizeSpec, decidingResults, type SizeRun } from '../../api.js';
import { parseSpec } from '../../spec/index.js';
import type { DesignSpec } from '../../spec/types.js';
import { renderSizeText, renderSizeBrief, stackCharts, htmlReport, type FrontPoint as ReportFront, type DesignCurves } from '../../report/index.js';
import { designCurves, defaultVds } from '../../device/index.js';
import { designNetlist } from '../../spice/index.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { EXIT } from '../../errors.js';
import type { Polarity } from '../../table/types.js';
import type { FrontPoint } from '../../solve/pareto.js';
import type { Kit } from '../../api.js';
import { note, out, packageVersion, readText, toJson, useColor } from '../io.js';
import { checkSpiceFlags, confirmRun, spiceOptions, type SpiceFlags } from './size-spice.js';
import { withCorrection } from '../../confirm/index.js';
import { renderConfirmText, missWords, type Confirmation } from '../../report/index.js';

interface SizeFlags extends SpiceFlags {
  tables?: string;
  json?: boolean;
  brief?: boolean;
  front?: string;
  netlist?: string;
  report?: string;
  force?: boolean;
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

export function reportHtml(spec: DesignSpec, source: string, kit: Kit, run: SizeRun, confirmations?: Confirmation[]): string {
  const note = kit.table(run.result.stacks[0]?.device ?? 'n', run.result.corners[0]).meta.note;
  return htmlReport({
    spec: { parsed: spec, source },
    size: run.result,
    fronts: Object.entries(run.fronts).map(([stack, points]) => ({ stack, points: reportFront(points) })),
    designCurves: curvesFor(kit, run),
    generatedBy: `stackwright ${packageVersion()}`,
    notes: note ? [`kit ${kit.kit}: ${note}`] : [],
    confirmations,
  });
}

export function registerSize(program: Command): void {
  const cmd = program
    .command('size')
    .description('size every current source/sink of a spec so Rout and headroom are met at once')
    .argument('<spec>', 'design spec (YAML or JSON)')
    .option('--tables <dir>', 'tables folder')
    .option('--json', 'print the result as JSON')
    .option('--brief', 'one line per stack instead of the full account')
    .option('--front <file.csv>', 'write the Pareto front (headroom, Rout, area) as CSV, and an SVG chart per stack beside it')
    .option('--netlist <file.cir>', 'write a SPICE3 netlist of the sized stacks with their bias')
    .option('--report <file.html>', 'write a self-contained HTML report')
    .option('--force', 'overwrite existing output files');
  spiceOptions(cmd)
    .addHelpText('after', '\nExit status: 0 every stack feasible (and confirmed with --spice), 3 a stack infeasible (or not confirmed in simulation), 2 bad input.\nExample:\n  stackwright size demo-tables/specs/marsh-wren.yaml --report report.html\n  stackwright size demo-tables/specs/marsh-wren-spice.yaml --spice --include demo-tables/reed180/reed180.lib --model-n nch_reed --model-p pch_reed\n')
    .action(async (specPath: string, f: SizeFlags) => {
      checkSpiceFlags(f, (flag) => cmd.getOptionValueSource(flag) === 'cli');
      const source = readText(specPath, 'spec file');
      const spec = parseSpec(source, specPath);
      const kit = loadKit(spec.kit, { tables: f.tables });
      const run = sizeSpec(spec, kit);
      const confirmations = f.spice ? await confirmRun(spec, run.result, kit, f) : undefined;

      // Build every output first, then write them together: nothing half-written.
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
        // With --spice the netlist carries the sizes simulation confirmed.
        const chosen = { ...run.result, stacks: decidingResults(run.result).map((r) => withCorrection(r, confirmations?.find((c) => c.name === r.name))) };
        files.push([f.netlist, designNetlist(chosen, { supply: spec.supply, specs: spec.stacks, title: `stackwright ${basename(specPath)}` })]);
      }
      if (f.report) files.push([f.report, reportHtml(spec, source, kit, run, confirmations)]);
      writeFilesAtomic(files, { force: f.force });

      if (f.json) out(toJson({ ...run.result, fronts: run.fronts }));
      else {
        out((f.brief ? renderSizeBrief : renderSizeText)(run.result, { color: useColor() }));
        if (confirmations) out(renderConfirmText(confirmations, run.result, spec, { color: useColor() }));
      }
      for (const [path] of files) note(`wrote ${path}`);
      const failed = decidingResults(run.result).filter((s) => !s.feasible);
      if (failed.length > 0) {
        note(`infeasible: ${failed.map((s) => `${s.name} (${s.binding ?? 'targets not met'})`).join('; ')}`);
        process.exitCode = EXIT.infeasible;
      }
      const missed = (confirmations ?? []).filter((c) => !c.confirmed);
      if (missed.length > 0) {
        note(`not confirmed in simulation: ${missed.map((c) => `${c.name} (${c.misses.map(missWords).join('; ') || 'no design step helps'})`).join('; ')}`);
        process.exitCode = EXIT.infeasible;
      }
    });
}
