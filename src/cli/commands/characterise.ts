import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import { characterise, characterisationDeck, dataFileFor, type CharacterisationOptions, type Pin, type SweepRange } from '../../spice/index.js';
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
  instance: 'm' | 'x';
  pins?: Pin[];
  inner?: string;
  innerModel?: string;
}

/** `d,g,s,b` in any order. */
function pinsFlag(value: string): Pin[] {
  const pins = value.split(',').map((p) => p.trim().toLowerCase());
  if (pins.length !== 4 || [...pins].sort().join(',') !== 'b,d,g,s') {
    throw new StackwrightError(`expected the four pins d,g,s,b in the subcircuit's order (e.g. d,g,s,b or g,d,b,s), got "${value}"`, { where: '--pins' });
  }
  return pins as Pin[];
}

function instanceFlag(value: string): 'm' | 'x' {
  const v = value.trim().toLowerCase();
  if (v !== 'm' && v !== 'x') throw new StackwrightError(`expected m (a MOSFET model) or x (a subcircuit), got "${value}"`, { where: '--instance' });
  return v;
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
    .requiredOption('--model <name>', 'model (or, with --instance x, subcircuit) name in your model file')
    .requiredOption('--device <n|p>', 'device polarity', polarityFlag)
    .option('--include <file>', 'model file to .include (or a literal .lib/.include line, e.g. ".lib models.lib tt")')
    .requiredOption('--l <list>', 'channel lengths, comma-separated, e.g. 0.18u,0.36u,0.72u', listFlag('--l', true))
    .option('--w <width>', 'reference width', engFlag('--w'), 1e-6)
    .option('--vgs <from:to:step>', '|VGS| sweep', rangeFlag('--vgs'), { from: 0, to: 1.8, step: 0.025 })
    .option('--vds <from:to:step>', '|VDS| sweep', rangeFlag('--vds'), { from: 0, to: 1.8, step: 0.05 })
    .option('--vsb <list>', '|VSB| values, comma-separated', listFlag('--vsb', false), [0, 0.3, 0.6, 0.9])
    .option('--temperature <°C>', 'simulation temperature (omit when the model section sets it)', engFlag('--temperature'))
    .option('--instance <m|x>', 'place the model as a MOSFET (m) or as a subcircuit wrapping one (x)', instanceFlag, 'm')
    .option('--pins <order>', "the instance's pin order, e.g. d,g,s,b (default) or g,d,b,s", pinsFlag)
    .option('--inner <name>', 'with --instance x: the MOSFET inside the subcircuit whose operating point is read, e.g. m1')
    .option('--inner-model <name>', 'model whose overlap capacitances (cgso, cgdo, cgbo) are added; default --model, required with --instance x')
    .option('--out <file.csv>', 'run ngspice and write the CSV here')
    .option('--deck <file.cir>', 'write the ngspice deck to run yourself (ngspice -b FILE.cir writes FILE.dat, which ingest reads as it is)')
    .option('--force', 'overwrite existing files')
    .addHelpText(
      'after',
      '\nExample:\n  stackwright characterise --model nfet_model --device n --include "models.lib" --l 0.18u,0.36u,0.72u,1.44u --out nfet_tt.csv\n' +
        '  stackwright ingest nfet_tt.csv --kit mykit --device n --corner tt\n' +
        '  stackwright characterise --model nfet_model --device n --include ".lib models.lib tt" --l 0.18u,1u --deck nfet_tt.cir\n' +
        '  ngspice -b nfet_tt.cir          # writes nfet_tt.dat\n' +
        '  stackwright ingest nfet_tt.dat --kit mykit --device n --corner tt\n' +
        '  stackwright characterise --model nfet_wrapped --instance x --pins d,g,s,b --inner m1 --inner-model nfet_core --device n --l 0.18u --deck w.cir\n',
    )
    .action(async (f: CharFlags) => {
      if (!f.out && !f.deck) throw new StackwrightError('give --out FILE.csv (run ngspice) and/or --deck FILE.cir (deck only)', { where: 'characterise' });
      const opts: CharacterisationOptions = {
        model: f.model, device: f.device, lengths: f.l, w: f.w, vgs: f.vgs, vds: f.vds, vsb: f.vsb, include: f.include, temperature: f.temperature,
        instance: f.instance, pins: f.pins, inner: f.inner, innerModel: f.innerModel,
      };
      const files: Array<[string, string]> = [];
      if (f.deck) files.push([f.deck, characterisationDeck({ ...opts, dataFile: dataFileFor(f.deck) })]);
      if (f.out) files.push([f.out, await characterise(opts, { timeoutMs: 30 * 60_000 })]);
      writeFilesAtomic(files, { force: f.force });
      for (const [path] of files) note(`wrote ${path}`);
    });
}
