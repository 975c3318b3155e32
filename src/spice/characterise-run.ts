import { characterisationDeck, type CharacterisationOptions } from './characterise.js';
import { characterisationCsv } from './characterise-csv.js';
import { existingInclude } from './include.js';
import { runNgspice, type RunOptions } from './run.js';

/** Characterise a model with ngspice and return the long-format CSV text. */
export async function characterise(opts: CharacterisationOptions, run: RunOptions = {}): Promise<string> {
  // ngspice runs in a folder of its own: a model file named relative to ours would not be found there.
  const include = opts.include === undefined || opts.include.trim() === '' ? opts.include : existingInclude(opts.include, '--include');
  const result = await runNgspice(characterisationDeck({ ...opts, include }), run);
  return characterisationCsv(result.files, opts);
}
