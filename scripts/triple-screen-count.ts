/**
 * How the triple screen's work grows with the table's length count: the kit's tables resampled to 8, 16, 32 and 63
 * lengths (log-spaced between its shortest and longest; slices between table lengths interpolate log–log), and the
 * screen of one triple stack run on each. Prints combinations covered and combinations rated one by one.
 *
 *   npx tsx scripts/triple-screen-count.ts [kit] [tables]
 */
import { loadKit } from '../src/api.js';
import type { KitAccess } from '../src/solve/kit.js';
import { makeContext } from '../src/solve/context.js';
import { screen } from '../src/solve/search/screen.js';
import type { StackSpec } from '../src/design/types.js';

const kitName = process.argv[2] ?? 'demo180';
const kit = loadKit(kitName, { tables: process.argv[3] ?? 'tables' });

function resampled(base: KitAccess, n: number): KitAccess {
  return {
    ...base,
    lengths: (corner, device) => {
      const t = base.lengths(corner, device);
      const lo = Math.log(t[0]);
      const hi = Math.log(t[t.length - 1]);
      return Float64Array.from({ length: n }, (_, j) => (j === n - 1 ? t[t.length - 1] : Math.exp(lo + ((hi - lo) * j) / (n - 1))));
    },
  };
}

// The demo spec's p-type load (demo-tables/specs/marsh-wren.yaml), as a triple.
const spec: StackSpec = { name: 'ota-load', device: 'p', topology: 'triple', current: 10e-6, rout: 100e6, headroom: 0.5, span: 1.5, objective: 'area' };
for (const n of [8, 16, 32, 63]) {
  const ctx = makeContext(spec, resampled(kit, n), 1.8, ['tt']);
  const t = performance.now();
  const kept = screen(ctx, 'triple').length;
  const ms = performance.now() - t;
  console.log(`${String(n).padStart(2)} lengths: ${ctx.count.screened.toLocaleString('en-US')} combinations covered, ${ctx.count.rated.toLocaleString('en-US')} rated one by one, ${kept} kept, ${ms.toFixed(0)} ms`);
}
