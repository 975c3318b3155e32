import { beforeAll, describe, expect, it } from 'vitest';
import { sizeSpec, type SizeRun } from '../src/api.js';
import { parseSpec } from '../src/design/index.js';
import { decidingResults } from '../src/solve/choose.js';
import { paretoFront, type FrontPoint } from '../src/solve/pareto.js';
import { stackCharts } from '../src/report/stack-charts.js';
import { demoKit, ensureDemoTables } from './helpers/cli.js';

const SPEC = `kit: demo180\nsupply: 1.8\nstacks:\n  - name: load\n    device: p\n    topology: auto\n    current: 10u\n    rout: 100meg\n    headroom: 0.5\n    span: 1.5\n`;

describe('Pareto chart', () => {
  let run: SizeRun;
  beforeAll(() => {
    ensureDemoTables();
    run = sizeSpec(parseSpec(SPEC, 'p.yaml'), demoKit('demo180'));
  });

  it('the front holds points of every topology that has exactly evaluated designs, the chosen one included', () => {
    const chosen = decidingResults(run.result)[0];
    const front = run.fronts.load;
    expect(front.some((p) => p.topology === chosen.topology)).toBe(true);
    // Each topology's points are its own Pareto front (no point dominated by one of the same topology):
    // the definition of Pareto optimality (common practice).
    for (const t of new Set(front.map((p) => p.topology))) {
      const mine = front.filter((p) => p.topology === t);
      expect(paretoFront(mine)).toHaveLength(mine.length);
    }
  });

  it('draws the chosen topology, first in the legend, and designs that miss a target hollow', () => {
    const chosen = decidingResults(run.result)[0];
    const spec = parseSpec(SPEC, 'p.yaml').stacks[0];
    // Add a missed-target copy of a point so both kinds are present.
    const front: FrontPoint[] = [...run.fronts.load, { ...run.fronts.load[0], feasible: false, headroom: run.fronts.load[0].headroom + 0.01 }];
    const svg = stackCharts(chosen, spec, front).pareto!;
    const series = [...svg.matchAll(/<g class="series scatter" data-series="([^"]+)"/g)].map((m) => m[1]);
    expect(series[0]).toBe(`front: ${chosen.topology} (chosen)`);
    const hollow = /<g class="series scatter" data-series="[^"]*misses a target">(.*?)<\/g>/s.exec(svg);
    expect(hollow).not.toBeNull();
    expect(hollow![1]).toMatch(/fill="#ffffff"/);
    const filled = /<g class="series scatter" data-series="front: [^",]*(?: \(chosen\))?">(.*?)<\/g>/s.exec(svg)!;
    expect(filled[1]).not.toMatch(/fill="#ffffff"/);
  });
});
