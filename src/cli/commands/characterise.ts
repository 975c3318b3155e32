import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { characterise, characterisationDeck, type CharacterisationOptions, type SweepRange } from '../../spice/index.js';
import { writeFilesAtomic } from '../../fsutil.js';
import { parseEng } from '../../units/index.js';
import { engFlag, polarityFlag } from '../options.js';
import { note } from '../io.js';

interface CharFlags {
  model: string;
  device: 'n' | 'p';
  include?: string;
  l: number[];
  w: number;
  vgs: SweepRange;
  vds: SweepRange;
  vsb: number[];
  temperature?: number;
  out?: string;
  deck?: string;
  force?: boolean;
}

/** `FROM:TO:STEP` in engineering notation. */
export function rangeFlag(flag: string) {
  return (value: string): SweepRange => {
    const parts = value.split(':');
    if (parts.length !== 3) throw new StackwrightError(`expected FROM:TO:STEP (e.g. 0:1.8:25m), got "${value}"`, { where: flag });
    const [from, to, step] = parts.map((p) => parseEng(p, flag));
    if (!(to > from) || !(step > 0) || step > to - from) throw new StackwrightError(`expected FROM < TO and 0 < STEP <= TO - FROM, got "${value}"`, { where: flag });
    return { from, to, step };
  };
}

/** A comma-separated list in engineering notation. */
export function listFlag(flag: string, positive: boolean) {
  return (value: string): number[] => {
    const xs = value.split(',').map((p) => parseEng(p, flag));
    if (xs.length === 0 || (positive && xs.some((x) => !(x > 0))) || xs.some((x) => x < 0)) {
      throw new StackwrightError(`expected a comma-separated list of ${positive ? 'positive' : 'non-negative'} values, got "${value}"`, { where: flag });
    }
    return xs;
  };
}

export function registerCharacterise(program: Command): void {
  program
    .command('characterise')
    .description('sweep a transistor model in ngspice into the long-format CSV that `ingest` reads (or write the deck only)')
    .requiredOption('--model <name>', 'model name in your model file')
    .requiredOption('--device <n|p>', 'device polarity', polarityFlag)
    .option('--include <file>', 'model file to .include (or a literal .lib/.include line, e.g. ".lib models.lib tt")')
    .requiredOption('--l <list>', 'channel lengths, comma-separated, e.g. 0.18u,0.36u,0.72u', listFlag('--l', true))
    .option('--w <width>', 'reference width', engFlag('--w'), 1e-6)
    .option('--vgs <from:to:step>', '|VGS| sweep', rangeFlag('--vgs'), { from: 0, to: 1.8, step: 0.025 })
    .option('--vds <from:to:step>', '|VDS| sweep', rangeFlag('--vds'), { from: 0, to: 1.8, step: 0.05 })
    .option('--vsb <list>', '|VSB| values, comma-separated', listFlag('--vsb', false), [0, 0.3, 0.6, 0.9])
    .option('--temperature <°C>', 'simulation temperature (omit when the model section sets it)', engFlag('--temperature'))
    .option('--out <file.csv>', 'run ngspice and write the CSV here')
    .option('--deck <file.cir>', 'write the ngspice deck (to run yourself) instead of, or as well as, running it')
    .option('--force', 'overwrite existing files')
    .addHelpText('after', '\nExample:\n  stackwright characterise --model nch --device n --include "models.lib" --l 0.18u,0.36u,0.72u,1.44u --out nch_tt.csv\n  stackwright ingest nch_tt.csv --kit mykit --device n --corner tt\n')
    .action(async (f: CharFlags) => {
      if (!f.out && !f.deck) throw new StackwrightError('give --out FILE.csv (run ngspice) and/or --deck FILE.cir (deck only)', { where: 'characterise' });
      const opts: CharacterisationOptions = {
        model: f.model, device: f.device, lengths: f.l, w: f.w, vgs: f.vgs, vds: f.vds, vsb: f.vsb, include: f.include, temperature: f.temperature,
      };
      const files: Array<[string, string]> = [];
      if (f.deck) files.push([f.deck, characterisationDeck(opts)]);
      if (f.out) files.push([f.out, await characterise(opts, { timeoutMs: 30 * 60_000 })]);
      writeFilesAtomic(files, { force: f.force });
      for (const [path] of files) note(`wrote ${path}`);
    });
}
