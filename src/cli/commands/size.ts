import { basename, extname } from 'node:path';
import type { Command } from 'commander';
import { loadKit, sizeSpec, decidingResults, type SizeRun } from '../../api.js';
import { parseSpec } from '../../design/index.js';
import { bindingText, frontCharts, frontCsv, renderSizeText, renderSizeBrief, reportHtml } from '../../report/index.js';
import { designNetlist, stageNetlist } from '../../spice/index.js';
import { decidingStages } from '../../solve/stage-choose.js';
import { stageVerdictText } from '../../report/index.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { EXIT } from '../../errors.js';
import { note, out, packageVersion, readText, toJson, useColor } from '../io.js';
import { checkSpiceFlags, confirmRun, spiceOptions, type SpiceFlags } from './size-spice.js';
import { withCorrection, withStageCorrection } from '../../confirm/index.js';
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
    .addHelpText('after', '\nExit status: 0 every stack and stage feasible (and confirmed with --spice), 3 one infeasible (or not confirmed in simulation), 2 bad input.\nExample:\n  stackwright size demo-tables/specs/marsh-wren.yaml --report report.html\n  stackwright size demo-tables/specs/marsh-wren-spice.yaml --spice --include demo-tables/reed180/reed180.lib --model-n nfet_reed --model-p pfet_reed\n')
    .action(async (specPath: string, f: SizeFlags) => {
      checkSpiceFlags(f, (flag) => cmd.getOptionValueSource(flag) === 'cli');
      const source = readText(specPath, 'spec file');
      const spec = parseSpec(source, specPath);
      const kit = loadKit(spec.kit, { tables: f.tables });
      const run = sizeSpec(spec, kit);
      const confirmed = f.spice ? await confirmRun(spec, run.result, kit, f) : undefined;
      const confirmations = confirmed?.stacks;

      // Build every output first, then write them together: nothing half-written.
      const files: Array<[string, string]> = [];
      if (f.front) {
        files.push([f.front, frontCsv(run.fronts)]);
        const stem = f.front.slice(0, f.front.length - extname(f.front).length);
        for (const [name, svg] of frontCharts(spec, run)) files.push([`${stem}.${name}.svg`, svg]);
      }
      if (f.netlist) {
        // With --spice the netlist carries the sizes simulation confirmed.
        const chosen = { ...run.result, stacks: decidingResults(run.result).map((r) => withCorrection(r, confirmations?.find((c) => c.name === r.name))) };
        if (chosen.stacks.length > 0) files.push([f.netlist, designNetlist(chosen, { supply: spec.supply, specs: spec.stacks, title: `stackwright ${basename(specPath)}` })]);
        // Each stage gets its own deck beside it (its own .dc sweep of the input).
        const stem = f.netlist.slice(0, f.netlist.length - extname(f.netlist).length);
        for (const st of decidingStages(run.result)) {
          if (st.input.devices.length > 0) files.push([`${stem}.${st.name}.cir`, stageNetlist(withStageCorrection(st, confirmed?.stages.find((c) => c.name === st.name)), { supply: spec.supply })]);
        }
      }
      if (f.report) files.push([f.report, reportHtml(spec, source, kit, run, `stackwright ${packageVersion()}`, confirmations, confirmed?.stages)]);
      writeFilesAtomic(files, { force: f.force });

      if (f.json) out(toJson(run.stageFronts ? { ...run.result, fronts: run.fronts, stageFronts: run.stageFronts } : { ...run.result, fronts: run.fronts }));
      else {
        const stageGains = Object.fromEntries((spec.stages ?? []).map((st) => [st.name, st.gain]));
        out((f.brief ? renderSizeBrief : renderSizeText)(run.result, { color: useColor(), stageFronts: run.stageFronts, stageGains }));
        if (confirmed) out(renderConfirmText(confirmed.stacks, run.result, spec, { color: useColor() }, confirmed.stages));
      }
      for (const [path] of files) note(`wrote ${path}`);
      const failed = decidingResults(run.result).filter((s) => !s.feasible);
      const failedStages = decidingStages(run.result).filter((s) => !s.feasible);
      if (failed.length + failedStages.length > 0) {
        const words = [
          ...failed.map((s) => `${s.name} (${bindingText(s) || 'targets not met'})`),
          ...failedStages.map((s) => `${s.name} (${s.binding ? stageVerdictText(s.binding, true) : 'targets not met'})`),
        ];
        note(`infeasible: ${words.join('; ')}`);
        process.exitCode = EXIT.infeasible;
      }
      const missed = [...(confirmed?.stacks ?? []), ...(confirmed?.stages ?? [])].filter((c) => !c.confirmed);
      if (missed.length > 0) {
        note(`not confirmed in simulation: ${missed.map((c) => `${c.name} (${c.misses.map(missWords).join('; ') || 'no design step helps'})`).join('; ')}`);
        process.exitCode = EXIT.infeasible;
      }
    });
}
