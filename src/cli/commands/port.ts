import type { Command } from 'commander';
import { loadKit, portSpec } from '../../api.js';
import { parseSpec } from '../../design/index.js';
import { renderPortText, bindingText, stageVerdictText } from '../../report/index.js';
import { EXIT, StackwrightError } from '../../errors.js';
import { kitVdsTop } from '../../solve/table-cover.js';
import { formatEng } from '../../units/index.js';
import { engFlag } from '../options.js';
import { note, out, readText, toJson, useColor } from '../io.js';

interface PortFlags {
  from?: string;
  to: string;
  supply?: number;
  tables?: string;
  json?: boolean;
}

export function registerPort(program: Command): void {
  program
    .command('port')
    .description('re-size a spec on a new kit and show old against new, with what got harder')
    .argument('<spec>', 'design spec (YAML or JSON)')
    .option('--from <kit>', 'kit the design was sized on (default: the spec\'s kit)')
    .requiredOption('--to <kit>', 'new kit')
    .option('--supply <V>', 'supply on the new kit (default: the spec\'s, capped at the top of the new tables)', engFlag('--supply'))
    .option('--tables <dir>', 'tables folder')
    .option('--json', 'print JSON')
    .addHelpText('after', '\nExit status: 0 every ported stack feasible, 3 one is not.\nExample:\n  stackwright port demo-tables/specs/marsh-wren.yaml --from demo180 --to demo090\n')
    .action((specPath: string, f: PortFlags) => {
      const spec = parseSpec(readText(specPath, 'spec file'), specPath);
      const from = loadKit(f.from ?? spec.kit, { tables: f.tables });
      const to = loadKit(f.to, { tables: f.tables });
      if (f.supply !== undefined) {
        // A supply the new tables cannot describe is bad input, not an infeasible design.
        if (!(f.supply > 0)) throw new StackwrightError(`expected a positive supply, got ${formatEng(f.supply, 'V', 4)}`, { where: '--supply' });
        const top = kitVdsTop(to, to.corners);
        if (f.supply > top * (1 + 1e-9)) {
          throw new StackwrightError(`${formatEng(f.supply, 'V', 4)} is above the VDS range of kit ${to.kit}'s tables, which ends at ${formatEng(top, 'V', 4)}`, { where: '--supply' });
        }
      }
      const run = portSpec(spec, from, to, { supply: f.supply });
      if (f.json) {
        out(toJson({ from: from.kit, to: to.kit, notes: run.notes, supply: { from: spec.supply, to: run.toSpec.supply }, caution: run.to.result.caution, stacks: run.stacks, ...(run.stages.length ? { stages: run.stages } : {}) }));
      } else out(renderPortText(run, { color: useColor() }));
      const failed = run.stacks.filter((s) => !s.to.feasible);
      const failedStages = run.stages.filter((s) => !s.to.feasible);
      if (failed.length + failedStages.length) {
        const words = [
          ...failed.map((s) => `${s.name} (${bindingText(s.to) || 'targets not met'})`),
          ...failedStages.map((s) => `${s.name} (${s.to.binding ? stageVerdictText(s.to.binding, true) : 'targets not met'})`),
        ];
        note(`infeasible on ${to.kit}: ${words.join('; ')}`);
        process.exitCode = EXIT.infeasible;
      }
    });
}
