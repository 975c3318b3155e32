import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO, cli, ensureDemoTables } from './helpers/cli.js';
import { loadKit, sizeSpec, sizeSpecParallel } from '../src/api.js';
import { parseSpec } from '../src/design/index.js';
import { renderSizeText } from '../src/report/size-text.js';
import { topologyNames } from '../src/topology/index.js';
import { AUTO_TOPOLOGIES, sizeItems, splitItems, threadsFor, type SizeItem } from '../src/solve/parallel-plan.js';
import { fromWire, toWire } from '../src/solve/parallel-error.js';
import { exitCodeFor, StackwrightError } from '../src/errors.js';
import { jobsArg, mayUseWorkers } from '../src/cli/size-prestart.js';
import { sizeWorkerUrl, startSizeWorker } from '../src/solve/size-worker-start.js';
import { scratchDir } from './helpers/scratch.js';

const DEMO = join('demo-tables', 'specs', 'marsh-wren.yaml');
const tables = () => join(REPO, 'tables');

/** Makespan of the best split of `costs` over `m` groups, by trying every assignment (small inputs only). */
function optimalMakespan(costs: number[], m: number): number {
  let best = Infinity;
  const load = new Array<number>(m).fill(0);
  const visit = (k: number): void => {
    if (k === costs.length) {
      best = Math.min(best, Math.max(...load));
      return;
    }
    for (let g = 0; g < m; g++) {
      load[g] += costs[k];
      visit(k + 1);
      load[g] -= costs[k];
    }
  };
  visit(0);
  return best;
}

const items = (costs: number[]): SizeItem[] => costs.map((cost, index) => ({ kind: 'stack', index, cost }));

describe('parallel sizing plan (pure)', () => {
  it('an auto stack or an auto stage load counts as every registered topology, times the corners', () => {
    expect(AUTO_TOPOLOGIES).toBe(topologyNames().length);
    const spec = parseSpec(readFileSync(join(REPO, DEMO), 'utf8'), DEMO);
    // marsh-wren: ota-tail cascode, three auto stacks, one stage with an auto load; one corner.
    expect(sizeItems(spec).map((i) => [i.kind, i.index, i.cost])).toEqual([
      ['stack', 0, 1], ['stack', 1, 4], ['stack', 2, 4], ['stack', 3, 4], ['stage', 0, 4],
    ]);
    const three = { ...spec, corners: ['tt', 'ff', 'ss'] };
    expect(sizeItems(three).map((i) => i.cost)).toEqual([3, 12, 12, 12, 12]);
    expect(sizeItems({ ...spec, corners: ['all'] }, 3).map((i) => i.cost)).toEqual([3, 12, 12, 12, 12]);
  });

  it('every item lands in exactly one share, each share in spec order, none empty', () => {
    for (const [costs, m] of [[[1, 4, 4, 4, 4], 2], [[3, 1, 2], 3], [[5], 4], [[2, 2, 2, 2, 2, 2, 2], 3]] as Array<[number[], number]>) {
      const split = splitItems(items(costs), m);
      expect(split).toHaveLength(Math.min(m, costs.length));
      for (const g of split) {
        expect(g.length).toBeGreaterThan(0);
        expect([...g].sort((a, b) => a - b)).toEqual(g);
      }
      expect(split.flat().sort((a, b) => a - b)).toEqual(costs.map((_, k) => k));
    }
  });

  it("the split's largest share is within Graham's bound for longest-first list scheduling", () => {
    // R. L. Graham, "Bounds on multiprocessing timing anomalies", SIAM J. Appl. Math. 17 (1969) 416-429:
    // longest-processing-time-first assignment is within (4/3 - 1/(3m)) of the optimal makespan on m machines.
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let trial = 0; trial < 60; trial++) {
      const n = 2 + Math.floor(rand() * 7);
      const m = 2 + Math.floor(rand() * 2);
      const costs = Array.from({ length: n }, () => [1, 3, 4, 12][Math.floor(rand() * 4)]);
      const split = splitItems(items(costs), m);
      const makespan = Math.max(...split.map((g) => g.reduce((s, k) => s + costs[k], 0)));
      expect(makespan).toBeLessThanOrEqual((4 / 3 - 1 / (3 * m)) * optimalMakespan(costs, m) + 1e-12);
    }
  });

  it('threads: the asked number or the cores, never more than the items, at least one', () => {
    expect(threadsFor(5, 2)).toBe(2);
    expect(threadsFor(5, 1)).toBe(1);
    expect(threadsFor(1, 8)).toBe(1);
    expect(threadsFor(5, 8, 1)).toBe(1);
    expect(threadsFor(3, 2, 16)).toBe(3);
  });

  it('the CLI starts a worker early only when more than one thread may be used', () => {
    const argv = (...a: string[]) => ['node', 'stackwright', 'size', 'spec.yaml', ...a];
    expect(jobsArg(argv('--jobs', '3'))).toBe('3');
    expect(jobsArg(argv('--jobs=2'))).toBe('2');
    // One thread is the default (two measured slower on a 2-core machine: node's own compiler and collector threads use the second core).
    expect(mayUseWorkers(argv(), 2)).toBe(false);
    expect(mayUseWorkers(argv('--jobs', '2'), 2)).toBe(true);
    expect(mayUseWorkers(argv('--jobs=3'), 4)).toBe(true);
    expect(mayUseWorkers(argv(), 1)).toBe(false);
    expect(mayUseWorkers(argv('--jobs', '1'), 2)).toBe(false);
    expect(mayUseWorkers(argv('--jobs', 'x'), 2)).toBe(false);
    expect(mayUseWorkers(argv('--help'), 2)).toBe(false);
  });

  it('the worker entry is found beside the code that starts it: source, tsc output and the CLI bundle', () => {
    expect(sizeWorkerUrl('file:///p/src/solve/size-worker-start.ts').href).toBe('file:///p/src/solve/size-worker.ts');
    expect(sizeWorkerUrl('file:///p/dist/src/solve/size-worker-start.js').href).toBe('file:///p/dist/src/solve/size-worker.js');
    // scripts/bundle-cli.ts writes size-worker.mjs beside the CommonJS CLI bundle.
    expect(sizeWorkerUrl('file:///p/dist/cli/stackwright-bundle.cjs').href).toBe('file:///p/dist/cli/size-worker.mjs');
    expect(readFileSync(join(REPO, 'scripts', 'bundle-cli.ts'), 'utf8')).toMatch(/outfile: join\(outdir, 'size-worker\.mjs'\)/);
  });

  it('an error crossing from a worker keeps its message, where and exit status', () => {
    const bad = fromWire(toWire(new StackwrightError('L range is outside the table', { where: 'stack "a".l' })));
    expect(bad).toBeInstanceOf(StackwrightError);
    expect(bad.message).toBe('stack "a".l: L range is outside the table');
    expect((bad as StackwrightError).where).toBe('stack "a".l');
    expect(exitCodeFor(bad)).toBe(2);
    const range = fromWire(toWire(new StackwrightError('no current', { kind: 'range' })));
    expect(exitCodeFor(range)).toBe(2);
    const internal = fromWire(toWire(new TypeError('x is not a function')));
    expect(internal).not.toBeInstanceOf(StackwrightError);
    expect(internal.message).toBe('x is not a function');
    expect(exitCodeFor(internal)).toBe(1);
  });
});

// The property under test is equivalence: the serial path (sizeSpec, --jobs 1) is the reference.
describe('parallel sizing gives the serial result (demo180, invented demo kit)', () => {
  let dir = '';
  beforeAll(() => {
    ensureDemoTables();
    dir = scratchDir('stackwright-parallel-');
  });

  it('size of the demo spec: text, front CSV, charts and report byte-identical with --jobs 1 and --jobs 2', () => {
    const run = (jobs: string) => {
      const stem = join(dir, `demo-${jobs}`);
      const r = cli(['size', DEMO, '--jobs', jobs, '--tables', tables(), '--front', `${stem}.csv`, '--report', `${stem}.html`]);
      expect(r.code, r.stderr).toBe(0);
      const files = ['csv', 'ota-load.svg', 'html'].map((ext) => readFileSync(`${stem}.${ext}`, 'utf8'));
      return { stdout: r.stdout, files, stderr: r.stderr.replaceAll(`demo-${jobs}`, 'demo-N') };
    };
    const serial = run('1');
    const parallel = run('2');
    expect(serial.stdout).toMatch(/ota-tail/);
    expect(parallel.stdout).toBe(serial.stdout);
    expect(parallel.stderr).toBe(serial.stderr);
    for (let k = 0; k < serial.files.length; k++) expect(parallel.files[k]).toBe(serial.files[k]);
  });

  it('size --json of the demo spec: deep-equal and byte-identical with the default (one thread) and --jobs 3', () => {
    const serial = cli(['size', DEMO, '--json', '--tables', tables()]);
    const parallel = cli(['size', DEMO, '--json', '--jobs', '3', '--tables', tables()]);
    expect(serial.code, serial.stderr).toBe(0);
    expect(parallel.code, parallel.stderr).toBe(0);
    expect(JSON.parse(parallel.stdout)).toEqual(JSON.parse(serial.stdout));
    expect(parallel.stdout).toBe(serial.stdout);
  });

  it('sizeSpecParallel equals sizeSpec on a spec with stacks, a stage and three corners', async () => {
    const text = `kit: demo180\ncorner: [tt, ff, ss]\nsupply: 1.8\nstacks:\n` +
      `  - {name: tail, device: n, topology: cascode, current: 40u, rout: 50meg, headroom: 0.5, span: 1.6, objective: area}\n` +
      `  - {name: load, device: p, topology: auto, current: 10u, rout: 100meg, headroom: 0.55, span: 1.5, objective: area}\n` +
      `stages:\n  - name: gain\n    current: 10u\n    gain: 800\n    swing: 0.8\n    output: 0.9\n` +
      `    input: {device: n, topology: cascode}\n    load: {topology: auto}\n    objective: area\n`;
    const spec = parseSpec(text, 'corners-stage.yaml');
    expect(spec.corners.length).toBe(3);
    const kit = loadKit(spec.kit, { tables: tables() });
    const serial = sizeSpec(spec, kit);
    const parallel = await sizeSpecParallel(spec, loadKit(spec.kit, { tables: tables() }), { jobs: 3 });
    expect(parallel).toEqual(serial);
    expect(JSON.stringify(parallel)).toBe(JSON.stringify(serial));
    const render = (r: typeof serial) => renderSizeText(r.result, { color: false, stageFronts: r.stageFronts, stageGains: { gain: 800 } });
    expect(render(parallel)).toBe(render(serial));
    expect(parallel.result.stages?.length).toBe(4);
  });

  it('--jobs must be a positive whole number: one line naming the flag, exit 2, nothing printed', () => {
    for (const bad of ['0', '-1', '1.5', 'two', '']) {
      const r = cli(['size', DEMO, '--jobs', bad, '--tables', tables()]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/--jobs/);
    }
  });

  it("an item failing in a worker fails as in serial sizing: same message, same exit status, nothing written", () => {
    // 'first' (one topology) goes to the worker, 'second' (auto, costlier) stays on the main thread.
    const text = `kit: demo180\nsupply: 1.8\nstacks:\n` +
      `  - {name: first, device: n, topology: cascode, current: 10u, rout: 10meg, headroom: 0.5, l: {min: 40u, max: 50u}, objective: area}\n` +
      `  - {name: second, device: p, topology: auto, current: 10u, rout: 10meg, headroom: 0.5, objective: area}\n`;
    const spec = join(dir, 'bad.yaml');
    writeFileSync(spec, text);
    const split = splitItems(sizeItems(parseSpec(text, spec)), 2);
    expect(split[0]).toEqual([1]);
    const run = (jobs: string) => cli(['size', spec, '--jobs', jobs, '--tables', tables(), '--report', join(dir, `bad-${jobs}.html`)]);
    const serial = run('1');
    const parallel = run('2');
    expect(serial.code).toBe(2);
    expect(serial.stderr).toMatch(/stack "first"\.l: L range/);
    expect(parallel.code).toBe(serial.code);
    expect(parallel.stderr.replaceAll('bad-2', 'bad-N')).toBe(serial.stderr.replaceAll('bad-1', 'bad-N'));
    expect(parallel.stdout).toBe('');
    expect(() => readFileSync(join(dir, 'bad-2.html'))).toThrow();
  });

  it('when several items fail, the one first in spec order is reported, as in serial sizing', async () => {
    const text = `kit: demo180\nsupply: 1.8\nstacks:\n` +
      `  - {name: first, device: n, topology: cascode, current: 10u, rout: 10meg, headroom: 0.5, l: {min: 40u, max: 50u}, objective: area}\n` +
      `  - {name: second, device: p, topology: auto, current: 10u, rout: 10meg, headroom: 0.5, l: {min: 30u, max: 35u}, objective: area}\n`;
    const spec = parseSpec(text, 'two-bad.yaml');
    const kit = loadKit(spec.kit, { tables: tables() });
    let serial: unknown;
    try {
      sizeSpec(spec, kit);
    } catch (e) {
      serial = e;
    }
    expect(serial).toBeInstanceOf(StackwrightError);
    await expect(sizeSpecParallel(spec, kit, { jobs: 2 })).rejects.toMatchObject({ message: (serial as Error).message, kind: (serial as StackwrightError).kind });
  });

  it('a worker that stopped before taking its share is an internal error (exit 1), not a hang or a half result', async () => {
    const spec = parseSpec(readFileSync(join(REPO, DEMO), 'utf8'), DEMO);
    const worker = startSizeWorker();
    await worker.terminate();
    const kit = loadKit(spec.kit, { tables: tables() });
    const err = await sizeSpecParallel(spec, kit, { jobs: 2, workers: [worker] }).then(() => undefined, (e: unknown) => e);
    expect(err).toBeInstanceOf(StackwrightError);
    expect((err as Error).message).toMatch(/^size worker stopped/);
    expect(exitCodeFor(err)).toBe(1);
  });
});
