/** The bare baseline as a whole process: read, split, parseFloat every cell of the file in argv[2]. */
import { bareParse } from './bare-parse.js';

const file = process.argv[2];
if (!file) throw new Error('usage: bare-main <file.csv>');
const { rows, sum } = bareParse(file);
process.stdout.write(`${rows} ${sum}\n`);
