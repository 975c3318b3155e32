/**
 * Regenerate the invented "Larkspur Microsystems" demo tables (fictional foundry):
 *   npx tsx scripts/synth-demo.ts [outDir] [--force]
 */
import { StackwrightError } from '../src/errors.js';
import { writeSynthKits } from '../src/synth/index.js';

const args = process.argv.slice(2);
const force = args.includes('--force');
const outDir = args.find((a) => !a.startsWith('--')) ?? 'demo-tables';
try {
  const written = await writeSynthKits(outDir, { force });
  console.log(`wrote ${written.length} files under ${outDir} (invented demonstration data)`);
} catch (e) {
  if (e instanceof StackwrightError) {
    console.error(`synth-demo: ${e.message}`);
    process.exit(e.kind === 'exists' ? 2 : 1);
  }
  throw e;
}
