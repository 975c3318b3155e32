import { StackwrightError } from '../errors.js';
import { existingInclude, librarySections, modelFile } from '../spice/include.js';

export { librarySections };

/** Where the simulation models come from: `--include` and the corner → library-section mapping. */
export interface ModelSource {
  /** A model file path, or a literal `.lib`/`.include` line (one corner only). */
  include: string;
  /** Library section per corner; default the corner's own name. */
  sections?: Record<string, string>;
}

/**
 * The model lines of one corner's deck. A file with library sections is
 * included as `.lib 'FILE' SECTION` (section = mapping, else the corner's name);
 * a file without sections serves a single corner as `.include`; a literal line
 * is used as written, for a single corner.
 */
export function cornerModels(src: ModelSource, corner: string, corners: readonly string[]): string {
  const text = src.include.trim();
  for (const key of Object.keys(src.sections ?? {})) {
    if (!corners.includes(key)) throw new StackwrightError(`corner "${key}" is not sized in this spec (corners ${corners.join(', ')})`, { where: '--section' });
  }
  if (text.startsWith('.')) {
    if (corners.length > 1) {
      throw new StackwrightError(`a literal line serves one corner, the spec has ${corners.length} (${corners.join(', ')}); give the model file and map corners with --section CORNER=SECTION`, { where: '--include' });
    }
    // ngspice runs the deck in a folder of its own: the line's file is taken from ours, as a plain path is.
    return existingInclude(text, '--include');
  }
  const { path, sections: have } = modelFile(text, '--include');
  const section = src.sections?.[corner] ?? corner;
  if (have.length === 0) {
    if (corners.length > 1 || src.sections?.[corner] !== undefined) {
      throw new StackwrightError(`has no .lib sections, so it cannot give corner "${corner}" its own models`, { where: `--include ${text}` });
    }
    return `.include '${path}'`;
  }
  if (!have.includes(section)) {
    const how = src.sections?.[corner] !== undefined ? `mapped from corner "${corner}"` : `for corner "${corner}" (map it with --section ${corner}=SECTION)`;
    throw new StackwrightError(`library section "${section}" ${how} is not in ${text} (has ${have.join(', ')})`, { where: '--section' });
  }
  return `.lib '${path}' ${section}`;
}
