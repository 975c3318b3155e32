/**
 * Child process for the ingest benchmark, one job per process so peak memory
 * (maxRSS) belongs to that job alone. Usage: ingest-worker.js <ingest|baseline> <file>.
 * Prints one JSON line: { ms, maxRssKb, rows }.
 */
import { bareParse } from './bare-parse.js';
import { msSince } from './stats.js';

async function main(): Promise<void> {
  const [mode, file] = process.argv.slice(2);
  if (!file || (mode !== 'ingest' && mode !== 'baseline')) throw new Error('usage: ingest-worker <ingest|baseline> <file>');
  let rows: number;
  let ms: number;
  if (mode === 'baseline') {
    const t0 = process.hrtime.bigint();
    rows = bareParse(file).rows;
    ms = msSince(t0);
  } else {
    // Loaded before the clock starts: module loading is not the importer's work.
    const { ingestFiles } = await import('../../src/ingest/index.js');
    const { tableSize } = await import('../../src/table/types.js');
    const t0 = process.hrtime.bigint();
    const table = ingestFiles([file], { kit: 'bench', device: 'n' });
    ms = msSince(t0);
    rows = tableSize(table.axes);
  }
  process.stdout.write(JSON.stringify({ ms, maxRssKb: process.resourceUsage().maxRSS, rows }) + '\n');
}

main().catch((e) => {
  process.stderr.write(`${(e as Error).message}\n`);
  process.exit(1);
});
