/** Find a demo kit by name (invented "Larkspur Microsystems" kits). */
import { StackwrightError } from '../errors.js';
import { DEMO_KITS } from './kits.js';
import type { KitDef } from './params.js';

export function lookupKit(name: string): KitDef {
  const kit = Object.prototype.hasOwnProperty.call(DEMO_KITS, name) ? DEMO_KITS[name] : undefined;
  if (!kit) throw new StackwrightError(`unknown demo kit "${name}" (known: ${Object.keys(DEMO_KITS).join(', ')})`, { where: 'synth kit' });
  return kit;
}
