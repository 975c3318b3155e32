/**
 * Only the ingest section of `npm run bench`: `npm run build && node dist/scripts/bench-ingest.js [pairs] [file.csv]`.
 * Prints the two rows (time and peak memory, medians and ranges of interleaved whole-process pairs).
 */
import { packageRoot } from '../src/table/locate.js';
import { benchIngest, renderRows } from './bench/index.js';

const runs = process.argv[2] ? Number(process.argv[2]) : 5;
const rows = benchIngest({ root: packageRoot(), runs, file: process.argv[3], log: (s) => process.stderr.write(s + '\n') });
process.stdout.write(renderRows(rows) + '\n');
