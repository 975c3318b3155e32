import { existsSync } from 'node:fs';
import { StackwrightError } from '../errors.js';
import { characterisationDeck, type CharacterisationOptions } from './characterise.js';
import { characterisationCsv } from './characterise-csv.js';
import { anchoredInclude } from './include.js';
import { runNgspice, type RunOptions } from './run.js';

/** Characterise a model with ngspice and return the long-format CSV text. */
export async function characterise(opts: CharacterisationOptions, run: RunOptions = {}): Promise<string> {
  // ngspice runs in a folder of its own: a model file named relative to ours would not be found there.
  const anchored = opts.include === undefined || opts.include.trim() === '' ? undefined : anchoredInclude(opts.include, process.cwd());
  if (anchored?.path !== undefined && !existsSync(anchored.path)) throw new StackwrightError('model file not found', { where: `--include ${opts.include!.trim()}` });
  const result = await runNgspice(characterisationDeck({ ...opts, include: anchored?.include ?? opts.include }), run);
  return characterisationCsv(result.files, opts);
}
