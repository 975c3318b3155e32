/**
 * A 1,000,000-row long-format sweep CSV on a regular grid, from the invented
 * demo180 n-type model (fictional foundry, not a real process), for timing the importer.
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { DEMO_KITS, SYNTH_COLUMNS, atCorner, evalDevice, fmt6 } from '../../src/synth/index.js';

/** 10 lengths × 50 VGS × 50 VDS × 40 VSB = 1,000,000 rows; voltages from integer mV so they are exact. */
export const BENCH_GRID = {
  lengthsNm: [180, 250, 350, 500, 700, 1000, 1400, 2000, 2800, 4000],
  vgsMv: range(50, 36),
  vdsMv: range(50, 36),
  vsbMv: range(40, 20),
} as const;

function range(n: number, stepMv: number): number[] {
  return Array.from({ length: n }, (_, i) => i * stepMv);
}

export function benchRows(): number {
  const g = BENCH_GRID;
  return g.lengthsNm.length * g.vgsMv.length * g.vdsMv.length * g.vsbMv.length;
}

/** Write the CSV to `path`, rows ordered l, vgs, vds, vsb (vsb fastest); returns the row count. */
export function writeBenchCsv(path: string): number {
  const kit = DEMO_KITS.demo180;
  const p = atCorner(kit.devices.n, kit.corners.tt);
  const fd = openSync(path, 'w');
  try {
    writeSync(fd, `# INVENTED benchmark data from the demo180 model (fictional foundry, not a real process)\n${SYNTH_COLUMNS.join(',')}\n`);
    const w = kit.w;
    const wText = fmt6(w);
    let rows = 0;
    for (const nm of BENCH_GRID.lengthsNm) {
      const l = nm / 1e9;
      const head = `${fmt6(l)},${wText},`;
      for (const g of BENCH_GRID.vgsMv) {
        const chunk: string[] = [];
        for (const d of BENCH_GRID.vdsMv) {
          for (const s of BENCH_GRID.vsbMv) {
            const v = evalDevice(p, { l, w, vgs: g / 1000, vds: d / 1000, vsb: s / 1000 });
            chunk.push(
              `${head}${fmt6(g / 1000)},${fmt6(d / 1000)},${fmt6(s / 1000)},${fmt6(v.id)},${fmt6(v.gm)},${fmt6(v.gds)},` +
                `${fmt6(v.gmb)},${fmt6(v.cgg)},${fmt6(v.cgs)},${fmt6(v.cgd)},${fmt6(v.cdd)}`,
            );
            rows++;
          }
        }
        writeSync(fd, chunk.join('\n') + '\n');
      }
    }
    return rows;
  } finally {
    closeSync(fd);
  }
}
