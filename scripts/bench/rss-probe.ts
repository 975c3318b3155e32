/**
 * Preloaded with `node --import` into both benchmark processes (bare script and
 * stackwright ingest): at exit it writes the process's peak resident memory
 * (maxRSS, KiB) to the file named by SW_BENCH_RSS, so both sides are measured the same way.
 */
import { writeFileSync } from 'node:fs';

const file = process.env.SW_BENCH_RSS;
if (file) process.on('exit', () => writeFileSync(file, String(process.resourceUsage().maxRSS)));
