import { characterisationDeck, type CharacterisationOptions } from './characterise.js';
import { characterisationCsv } from './characterise-csv.js';
import { runNgspice, type RunOptions } from './run.js';

/** Characterise a model with ngspice and return the long-format CSV text. */
export async function characterise(opts: CharacterisationOptions, run: RunOptions = {}): Promise<string> {
  const result = await runNgspice(characterisationDeck(opts), run);
  return characterisationCsv(result.files, opts);
}
