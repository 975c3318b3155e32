import type { Command } from 'commander';
import { StackwrightError } from '../../errors.js';
import type { Confirmation, StageConfirmation } from '../../confirm/index.js';
import type { DesignSpec } from '../../design/types.js';
import type { SizeResult } from '../../solve/types.js';
import type { KitAccess } from '../../solve/kit.js';
import { decidingResults } from '../../solve/choose.js';
import { decidingStages } from '../../solve/stage-choose.js';
import { progressBar } from '../progress.js';
export interface SpiceFlags {
  spice?: boolean;
  include?: string;
  modelN?: string;
  modelP?: string;
  section?: Record<string, string>;
  tighten?: boolean;
}

/** Collect repeated `--section CORNER=SECTION`. */
function collectSection(value: string, prev: Record<string, string> = {}): Record<string, string> {
  const eq = value.indexOf('=');
  if (eq <= 0 || eq === value.length - 1) throw new StackwrightError(`expected CORNER=SECTION, got "${value}"`, { where: '--section' });
  return { ...prev, [value.slice(0, eq).trim()]: value.slice(eq + 1).trim() };
}

/** The flags of `size --spice`, added to the size command. */
export function spiceOptions(cmd: Command): Command {
  return cmd
    .option('--spice', 'confirm every chosen design in ngspice with your models, correcting it until it meets its targets there')
    .option('--include <file>', 'with --spice: model file (its .lib sections serve the corners) or a literal .lib/.include line')
    .option('--model-n <name>', 'with --spice: n-type model name', 'nmos_model')
    .option('--model-p <name>', 'with --spice: p-type model name', 'pmos_model')
    .option('--section <corner=section>', 'with --spice: library section of a corner (repeatable; default the corner name)', collectSection)
    .option('--tighten', 'with --spice: shrink designs that show headroom (stacks) or swing (stages) to spare in simulation, and confirm again');
}

/** Check the flags before any work; throws for --include etc. without --spice. */
export function checkSpiceFlags(f: SpiceFlags, given: (flag: string) => boolean): void {
  if (f.spice) {
    if (!f.include) throw new StackwrightError('--spice needs the model file: --include FILE (with --model-n/--model-p naming its models)', { where: '--include' });
    return;
  }
  for (const flag of ['include', 'section', 'tighten'] as const) {
    if (given(flag)) throw new StackwrightError('only used with --spice', { where: `--${flag}` });
  }
}

/** Run the confirmation of stacks and stages (same decks) and merge its fields into the chosen results. */
export async function confirmRun(spec: DesignSpec, result: SizeResult, kit: KitAccess, f: SpiceFlags): Promise<{ stacks: Confirmation[]; stages: StageConfirmation[] }> {
  // The simulator code (child processes, temporary folders) loads only with --spice.
  const { confirmDesign } = await import('../../confirm/design.js');
  let bar = progressBar('ngspice round 1');
  let round = 1;
  const confirmations = await confirmDesign(
    { spec, result, kit, models: { n: f.modelN ?? 'nmos_model', p: f.modelP ?? 'pmos_model' } },
    {
      include: f.include!,
      sections: f.section,
      tighten: f.tighten,
      title: `stackwright size --spice ${spec.file}`,
      onProgress: (p) => {
        if (p.round !== round) {
          bar.done();
          round = p.round;
          bar = progressBar(`ngspice round ${round} (${p.designs} circuits)`);
        }
        bar.update(p.done, p.runs);
      },
    },
  );
  bar.done();
  const chosen = decidingResults(result);
  for (const c of confirmations.stacks) {
    const s = chosen.find((r) => r.name === c.name);
    if (s) Object.assign(s, { simulated: c.simulated, confirmed: c.confirmed, rounds: c.rounds, misses: c.misses }, c.corrected ? { corrected: c.corrected } : {}, c.tightened ? { tightened: true } : {});
  }
  const stages = decidingStages(result);
  for (const c of confirmations.stages) {
    const s = stages.find((r) => r.name === c.name);
    if (s) Object.assign(s, { simulated: c.simulated, confirmed: c.confirmed, rounds: c.rounds, misses: c.misses }, c.corrected ? { corrected: c.corrected } : {}, c.tightened ? { tightened: true } : {});
  }
  return confirmations;
}
