/**
 * Model include line for a deck: text starting with "." is used verbatim
 * (e.g. `.lib '/pdk/models.lib' tt`), anything else is taken as a file path.
 */
export function includeLines(include: string | undefined): string[] {
  if (include === undefined || include.trim() === '') return [];
  const text = include.trim();
  if (text.startsWith('.')) return text.split(/\r?\n/);
  return [`.include '${text}'`];
}
