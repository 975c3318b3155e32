import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { designNetlist } from '../../spice/index.js';
import { decidingResults } from '../../solve/choose.js';
import { parseSizeResult } from '../../solve/parse-result.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { note, out, readText } from '../io.js';

interface NetlistFlags {
  out?: string;
  modelN: string;
  modelP: string;
  include?: string;
  bias: 'ideal' | 'diodes';
  force?: boolean;
}

export function registerNetlist(program: Command): void {
  program
    .command('netlist')
    .description('write a SPICE3 netlist of sized stacks (from `size --json`) to verify in your simulator')
    .argument('<result.json>', 'output of `stackwright size SPEC --json`')
    .option('--out <file.cir>', 'write to a file instead of stdout')
    .option('--model-n <name>', 'n-type model name', 'nmos_model')
    .option('--model-p <name>', 'p-type model name', 'pmos_model')
    .option('--include <file>', 'model file to .include (or a literal .lib/.include line)')
    .option('--bias <ideal|diodes>', 'gates from ideal sources at the reported voltages, or from the sized diode bias devices', 'ideal')
    .option('--force', 'overwrite an existing file')
    .addHelpText('after', '\nExample:\n  stackwright size spec.yaml --json > result.json\n  stackwright netlist result.json --include models.lib --model-n nfet_model --model-p pfet_model --out stacks.cir\n')
    .action((path: string, f: NetlistFlags) => {
      if (f.bias !== 'ideal' && f.bias !== 'diodes') throw new StackwrightError(`expected ideal or diodes, got "${f.bias}"`, { where: '--bias' });
      const result = parseSizeResult(readText(path, 'result file'), path);
      // With topology 'auto' only the chosen design of each stack goes in.
      const chosen = { ...result, stacks: decidingResults(result) };
      const text = designNetlist(chosen, { supply: result.supply, models: { n: f.modelN, p: f.modelP }, include: f.include, bias: f.bias });
      if (f.out) {
        writeFilesAtomic([[f.out, text]], { force: f.force });
        note(`wrote ${f.out}`);
      } else out(text);
    });
}
