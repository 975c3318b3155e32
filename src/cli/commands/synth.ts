import type { Command } from 'commander';
import { writeSynthKits, DEMO_KIT_NAMES } from '../../synth/index.js';
import { note } from '../io.js';

export function registerSynth(program: Command): void {
  program
    .command('synth')
    .description('write the invented demo kits as characterisation CSV (physics-based, deterministic; not real process data)')
    .option('--out <dir>', 'output folder', 'demo-tables')
    .option('--force', 'overwrite existing files')
    .addHelpText('after', `\nKits: ${DEMO_KIT_NAMES.join(', ')} of the fictional foundry "Larkspur Microsystems".\nExample:\n  stackwright synth --out demo-tables --force\n`)
    .action(async (f: { out: string; force?: boolean }) => {
      const written = await writeSynthKits(f.out, { force: f.force });
      note(`wrote ${written.length} files to ${f.out} (invented demonstration data)`);
    });
}
