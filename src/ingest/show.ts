import { showText } from '../units/index.js';

/** Names from a file for a one-line message: at most `max` of them, each quoted and cut short. */
export function showList(names: readonly string[], max = 12, each = 24): string {
  const shown = names.slice(0, max).map((s) => showText(s, each));
  if (names.length > max) shown.push(`… (${names.length - max} more)`);
  return shown.join(', ');
}
