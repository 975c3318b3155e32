#!/usr/bin/env node
import { Command, CommanderError } from 'commander';
import { EXIT, exitCodeFor, StackwrightError } from '../errors.js';
import { note, packageVersion, useColor } from './io.js';

type Register = (program: Command) => void;

/** Command modules, loaded only when needed so a single command starts fast. */
const COMMANDS: Record<string, () => Promise<Register>> = {
  synth: async () => (await import('./commands/synth.js')).registerSynth,
  ingest: async () => (await import('./commands/ingest.js')).registerIngest,
  probe: async () => (await import('./commands/probe.js')).registerProbe,
  chart: async () => (await import('./commands/chart.js')).registerChart,
  kits: async () => (await import('./commands/kits.js')).registerKits,
  size: async () => (await import('./commands/size.js')).registerSize,
  netlist: async () => (await import('./commands/netlist.js')).registerNetlist,
  port: async () => (await import('./commands/port.js')).registerPort,
  characterise: async () => (await import('./commands/characterise.js')).registerCharacterise,
};

/** The program with the commands `argv` needs (all of them for top-level help). */
export async function buildProgram(argv: string[] = process.argv): Promise<Command> {
  const program = new Command('stackwright');
  program
    .description('gm/ID lookup-table sizing of cascode current sources and sinks from characterisation sweeps.\nSizes are first-cut estimates: verify them with the foundry models across corners before tape-out.')
    // package.json is read only when the version is asked for (any -V or --version: commander's own rule is narrower).
    .version(argv.some((a) => a === '--version' || /^-[^-]*V/.test(a)) ? packageVersion() : '')
    .configureOutput({ outputError: () => {} })
    .exitOverride();
  const wanted = argv[2] !== undefined && argv[2] in COMMANDS ? [argv[2]] : Object.keys(COMMANDS);
  for (const name of wanted) (await COMMANDS[name]())(program);
  for (const cmd of program.commands) cmd.exitOverride().configureOutput({ outputError: () => {} });
  return program;
}

export async function main(argv: string[]): Promise<number> {
  try {
    // A sizing worker starts now so its module loading overlaps ours (src/cli/size-prestart.ts).
    if (argv[2] === 'size') (await import('./size-prestart.js')).prestartSizeWorker(argv);
    const program = await buildProgram(argv);
    await program.parseAsync(argv);
    return process.exitCode === undefined ? EXIT.ok : Number(process.exitCode);
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.exitCode === 0 || e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return EXIT.ok;
      note(`stackwright: ${e.message.replace(/^error: /, '').split('\n')[0]} (see --help)`);
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

// A reader that stops early (`stackwright kits | head -1`) closes the pipe: stop quietly, as Unix tools do (common
// practice), instead of dying on an unhandled EPIPE with a stack trace.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code !== 'EPIPE') throw e;
  process.exit(process.exitCode ?? EXIT.ok);
});

main(process.argv).then((code) => {
  process.exitCode = code;
});
