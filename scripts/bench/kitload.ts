/** (e) Loading a whole kit (6 tables) against reading the same files' bytes, each in a fresh process. */
import { join } from 'node:path';
import { verdict, type BenchRow } from './result.js';
import { runNode } from './child.js';
import { median } from './stats.js';

const BARE = `const fs=require('fs'),p=require('path');const d=process.argv[1];const t=performance.now();let n=0;for(const f of fs.readdirSync(d))n+=fs.readFileSync(p.join(d,f)).length;console.log(performance.now()-t)`;

export function benchKitLoad(opts: { root: string; runs?: number; log?: (s: string) => void }): BenchRow[] {
  const runs = opts.runs ?? 7;
  const dir = join(opts.root, 'tables', 'demo180');
  const api = join(opts.root, 'dist', 'src', 'api.js');
  const ours = `import(${JSON.stringify(api)}).then(m=>{const t=performance.now();const k=m.loadKit('demo180',{tables:${JSON.stringify(join(opts.root, 'tables'))}});for(const d of ['n','p'])for(const c of k.corners)k.table(d,c);console.log(performance.now()-t)})`;
  const bare: number[] = [];
  const mine: number[] = [];
  for (let i = 0; i < runs; i++) {
    bare.push(Number(runNode(['-e', BARE, dir], opts.root).trim()));
    mine.push(Number(runNode(['-e', ours], opts.root).trim()));
  }
  const b = median(bare);
  const o = median(mine);
  opts.log?.(`kit load: read bytes ${b.toFixed(1)} ms, loadKit ${o.toFixed(1)} ms (medians)`);
  return [{
    section: 'e kit load', measured: 'loadKit demo180 (6 tables, decoded)', unit: 'ms', baseline: b, baselineLabel: 'readFileSync of the same files',
    ours: o, ratio: o / b, target: '< 100 ms', status: verdict(o, (x) => x < 100),
    note: `median of ${runs} fresh processes each, interleaved; time inside the process, module loading excluded`,
  }];
}
