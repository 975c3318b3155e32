/**
 * `npm run demo`: the main job on the invented demo kits, end to end through the CLI:
 * build the demo tables from their CSV sweeps, size the demo spec (report, Pareto
 * front, netlist), probe one device, port the design to the second kit, and (with
 * ngspice installed) confirm the sizes of a spec on the invented BSIM4 kit in simulation.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { buildDemoTables } from './build-demo-tables.js';
import { packageRoot } from '../src/table/locate.js';
import { cliPath } from './cli-path.js';

const root = packageRoot();
const cli = cliPath(root);
const spec = join('demo-tables', 'specs', 'marsh-wren.yaml');
const outDir = 'demo-output';

function run(title: string, args: string[], okCodes = [0]): number {
  process.stdout.write(`\n=== ${title}\n$ stackwright ${args.join(' ')}\n`);
  const r = spawnSync(process.execPath, [cli, ...args], { cwd: root, stdio: 'inherit' });
  const code = r.status ?? 1;
  if (!okCodes.includes(code)) {
    process.stderr.write(`demo: "stackwright ${args[0]}" exited with ${code}\n`);
    process.exit(code);
  }
  return code;
}

process.stdout.write('stackwright demo — invented demonstration kits of a fictional foundry; not real process data.\n');
buildDemoTables(root);
mkdirSync(join(root, outDir), { recursive: true });
run('probe one device of the demo kit', ['probe', '--kit', 'demo180', '--device', 'n', '--l', '0.5u', '--gmid', '15', '--vds', '0.6']);
const sized = run(
  'size the demo spec (every stack and the gain stage; topology auto tries all four)',
  ['size', spec, '--report', join(outDir, 'report.html'), '--front', join(outDir, 'front.csv'), '--netlist', join(outDir, 'stacks.cir'), '--force'],
  [0, 3],
);
run('size the amplifier sources at every corner (tt, ff, ss)', ['size', join('demo-tables', 'specs', 'marsh-wren-corners.yaml')], [0, 3]);
run('port the design from demo180 to demo090', ['port', spec, '--from', 'demo180', '--to', 'demo090'], [0, 3]);
const spiceSpec = join('demo-tables', 'specs', 'marsh-wren-spice.yaml');
if (spawnSync('ngspice', ['-v'], { encoding: 'utf8' }).error) {
  process.stdout.write(`\n=== confirm sizes in simulation (size --spice): ngspice is not installed; to run this step: sudo apt-get install ngspice\n`);
} else {
  run(
    'size the demo spec on the invented BSIM4 kit reed180 and confirm every stack and the gain stage in ngspice (corners tt, ss)',
    ['size', spiceSpec, '--spice', '--include', join('demo-tables', 'reed180', 'reed180.lib'), '--model-n', 'nfet_reed', '--model-p', 'pfet_reed',
      '--report', join(outDir, 'report-spice.html'), '--force'],
    [0, 3],
  );
}
run('design charts of the demo kit', ['chart', '--kit', 'demo180', '--device', 'n', '--out', join(outDir, 'charts'), '--force']);
process.stdout.write(
  `\ndemo: done${sized === 3 ? ' (some stacks infeasible, as reported above)' : ''}. Open ${join(outDir, 'report.html')} in a browser; ` +
    `the netlists ${join(outDir, 'stacks.cir')} and ${join(outDir, 'stacks.ota-gain.cir')} need your foundry models.\n` +
    'Sizes are first-cut estimates: verify them by simulation with the foundry models across corners before tape-out.\n',
);
