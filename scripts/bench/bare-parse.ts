import { readFileSync } from 'node:fs';

/** The bare floor: read, split lines and cells, parseFloat every cell (summed so it cannot be skipped). */
export function bareParse(path: string): { rows: number; sum: number } {
  const lines = readFileSync(path, 'utf8').split('\n');
  let rows = 0;
  let sum = 0;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    if (line === '' || line.charCodeAt(0) === 35) continue;
    const cells = line.split(',');
    for (let j = 0; j < cells.length; j++) {
      const x = parseFloat(cells[j]);
      if (x === x) sum += x;
    }
    rows++;
  }
  return { rows: rows - 1, sum }; // minus the header line
}
