import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { designNetlist } from '../../spice/netlist.js';
import { stageNetlist } from '../../spice/stage-netlist.js';
import { modelLine } from '../../spice/include.js';
import { withCorrection, withStageCorrection } from '../../confirm/apply.js';
import type { Confirmation, StageConfirmation } from '../../confirm/index.js';
import { decidingResults } from '../../solve/choose.js';
import type { SizeResult } from '../../solve/types.js';
import type { StackSpec } from '../../design/types.js';
import { parseSizeResult } from '../../solve/parse-result.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { note, out, readText } from '../io.js';

interface NetlistFlags {
  out?: string;
  modelN: string;
  modelP: string;
  include?: string;
  bias: 'ideal' | 'diodes';
  stage?: string;
  force?: boolean;
}

/** The spec targets `size --json` writes beside the result (absent in older files: .op then at mid-sweep). */
function targetsOf(result: SizeResult): StackSpec[] | undefined {
  const t = (result as SizeResult & { targets?: unknown }).targets;
  if (!Array.isArray(t)) return undefined;
  const ok = t.filter((x): x is StackSpec => !!x && typeof x === 'object' && typeof x.name === 'string' && typeof x.headroom === 'number' && typeof x.span === 'number'
    && typeof x.current === 'number' && typeof x.rout === 'number');
  return ok.length ? ok : undefined;
}

export function registerNetlist(program: Command): void {
  program
    .command('netlist')
    .description('write a SPICE3 netlist of sized stacks (from `size --json`) to verify in your simulator')
    .argument('<result.json>', 'output of `stackwright size SPEC --json`')
    .option('--out <file.cir>', 'write to a file instead of stdout')
    .option('--model-n <name>', 'n-type model name', 'nmos_model')
    .option('--model-p <name>', 'p-type model name', 'pmos_model')
    .option('--include <file>', 'model file (with .lib sections: the result\'s nominal corner), or a literal .lib/.include line')
    .option('--bias <ideal|diodes>', 'gates from ideal sources at the reported voltages, or from the sized diode bias devices', 'ideal')
    .option('--stage <name>', 'write the gain stage of this name instead (its input as a DC source to sweep)')
    .option('--force', 'overwrite an existing file')
    .addHelpText('after', '\nExample:\n  stackwright size spec.yaml --json > result.json\n  stackwright netlist result.json --include models.lib --model-n nfet_model --model-p pfet_model --out stacks.cir\n  stackwright netlist result.json --stage amp1 --out amp1.cir\n')
    .action((path: string, f: NetlistFlags) => {
      if (f.bias !== 'ideal' && f.bias !== 'diodes') throw new StackwrightError(`expected ideal or diodes, got "${f.bias}"`, { where: '--bias' });
      const result = parseSizeResult(readText(path, 'result file'), path);
      // With topology 'auto' only the chosen design of each stack goes in; a result of `size --spice`
      // gives the sizes simulation confirmed (`corrected`), as `size --spice --netlist` writes them.
      const chosen = { ...result, stacks: decidingResults(result).map((s) => withCorrection(s, s as Pick<Confirmation, 'corrected'>)) };
      const models = { n: f.modelN, p: f.modelP };
      // The deck carries the nominal corner's gates, so a sectioned model file serves that corner.
      const include = f.include === undefined ? undefined : modelLine(f.include, result.corners?.[0], '--include');
      let text: string;
      if (f.stage !== undefined) {
        const all = result.stages ?? [];
        const stage = all.find((s) => s.name === f.stage && s.chosen !== false);
        if (!stage) throw new StackwrightError(`no stage "${f.stage}" in ${path}` + (all.length ? ` (has ${[...new Set(all.map((s) => s.name))].join(', ')})` : ' (it has no stages)'), { where: '--stage' });
        text = stageNetlist(withStageCorrection(stage, stage as Pick<StageConfirmation, 'corrected'>), { supply: result.supply, models, include, bias: f.bias });
      } else text = designNetlist(chosen, { supply: result.supply, models, include, bias: f.bias, specs: targetsOf(result) });
      if (f.out) {
        writeFilesAtomic([[f.out, text]], { force: f.force });
        note(`wrote ${f.out}`);
      } else out(text);
    });
}
