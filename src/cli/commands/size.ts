import type { Command } from 'commander';
import { loadKit, sizeSpecParallel, decidingResults } from '../../api.js';
import { parseSpec } from '../../design/index.js';
import { renderSizeText, renderSizeBrief } from '../../report/size-text.js';
import { bindingText } from '../../report/verdict.js';
import { stageVerdictText } from '../../report/stage-rows.js';
import { decidingStages } from '../../solve/stage-choose.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { lengthClamps } from '../../solve/table-cover.js';
import { lengthClampNotes } from '../../report/notes.js';
import { EXIT, StackwrightError } from '../../errors.js';
import { takeEarlyWorkers } from '../size-prestart.js';
import { note, out, readText, toJson, useColor } from '../io.js';
import { checkSpiceFlags, confirmRun, spiceOptions, type SpiceFlags } from './size-spice.js';
import { renderConfirmText } from '../../report/confirm-text.js';
import { missWords } from '../../report/confirm-rows.js';

interface SizeFlags extends SpiceFlags {
  tables?: string;
  json?: boolean;
  brief?: boolean;
  front?: string;
  netlist?: string;
  report?: string;
  force?: boolean;
  jobs?: string;
}

/** --jobs: threads to size with, a positive whole number. */
export function parseJobs(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  if (!/^\s*\d+\s*$/.test(value) || !(Number(value) >= 1)) throw new StackwrightError(`expected a positive whole number of threads, got "${value}"`, { where: '--jobs' });
  return Number(value);
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
    .option('--force', 'overwrite existing output files')
    .option('--jobs <n>', 'threads to size stacks and stages on (default 1; more than 1 pays only with cores to spare: node already compiles and collects garbage on a second core)');
  spiceOptions(cmd)
    .addHelpText('after', '\nExit status: 0 every stack and stage feasible (and confirmed with --spice), 3 one infeasible (or not confirmed in simulation), 2 bad input.\nExample:\n  stackwright size demo-tables/specs/marsh-wren.yaml --report report.html\n  stackwright size demo-tables/specs/marsh-wren-spice.yaml --spice --include demo-tables/reed180/reed180.lib --model-n nfet_reed --model-p pfet_reed\n')
    .action(async (specPath: string, f: SizeFlags) => {
      checkSpiceFlags(f, (flag) => cmd.getOptionValueSource(flag) === 'cli');
      const jobs = parseJobs(f.jobs) ?? 1;
      const workers = takeEarlyWorkers();
      const source = readText(specPath, 'spec file');
      const spec = parseSpec(source, specPath);
      const kit = loadKit(spec.kit, { tables: f.tables });
      const run = await sizeSpecParallel(spec, kit, { jobs, workers });
      const notes = lengthClampNotes(lengthClamps(spec.stacks, kit, run.result.corners[0]));
      const confirmed = f.spice ? await confirmRun(spec, run.result, kit, f) : undefined;

      // Build every output first, then write them together: nothing half-written.
      // Charts, report and netlist code load only when one of them is asked for.
      const files = f.front || f.netlist || f.report
        ? (await import('./size-files.js')).sizeFiles(f, spec, specPath, source, kit, run, notes, confirmed?.stacks, confirmed?.stages)
        : [];
      writeFilesAtomic(files, { force: f.force });

      // The spec's targets ride along so `netlist` can place its .op at each stack's mid-span.
      if (f.json) out(toJson({ ...run.result, fronts: run.fronts, ...(run.stageFronts ? { stageFronts: run.stageFronts } : {}), targets: spec.stacks }));
      else {
        const stageGains = Object.fromEntries((spec.stages ?? []).map((st) => [st.name, st.gain]));
        out((f.brief ? renderSizeBrief : renderSizeText)(run.result, { color: useColor(), stageFronts: run.stageFronts, stageGains }));
        if (confirmed) out(renderConfirmText(confirmed.stacks, run.result, spec, { color: useColor() }, confirmed.stages));
      }
      for (const line of notes) note(`note: ${line}`);
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
