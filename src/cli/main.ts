#!/usr/bin/env node
import { Command, CommanderError } from 'commander';
import { EXIT, exitCodeFor, StackwrightError } from '../errors.js';
import { note, packageVersion, useColor } from './io.js';
import { registerSynth } from './commands/synth.js';
import { registerIngest } from './commands/ingest.js';
import { registerProbe } from './commands/probe.js';
import { registerChart } from './commands/chart.js';
import { registerKits } from './commands/kits.js';
import { registerSize } from './commands/size.js';
import { registerNetlist } from './commands/netlist.js';
import { registerPort } from './commands/port.js';

export function buildProgram(): Command {
  const program = new Command('stackwright');
  program
    .description('gm/ID lookup-table sizing of cascode current sources and sinks from characterisation sweeps.\nSizes are first-cut estimates: verify them with the foundry models across corners before tape-out.')
    .version(packageVersion())
    .showHelpAfterError('(run with --help for usage)')
    .configureOutput({ outputError: () => {} })
    .exitOverride();
  registerSynth(program);
  registerIngest(program);
  registerProbe(program);
  registerChart(program);
  registerKits(program);
  registerSize(program);
  registerNetlist(program);
  registerPort(program);
  for (const cmd of program.commands) cmd.exitOverride().configureOutput({ outputError: () => {} });
  return program;
}

export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return process.exitCode === undefined ? EXIT.ok : Number(process.exitCode);
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.exitCode === 0 || e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return EXIT.ok;
      note(`stackwright: ${e.message.replace(/^error: /, '')}`);
      return EXIT.input;
    }
    const red = useColor(process.stderr) ? (s: string) => `\x1b[31m${s}\x1b[0m` : (s: string) => s;
    if (e instanceof StackwrightError) {
      note(red(`stackwright: ${e.message.split('\n')[0]}`));
      return exitCodeFor(e);
    }
    note(red(`stackwright: internal error: ${(e as Error)?.stack ?? String(e)}`));
    return EXIT.internal;
  }
}

main(process.argv).then((code) => {
  process.exitCode = code;
});
