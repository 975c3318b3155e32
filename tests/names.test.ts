import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildProgram } from '../src/cli/main.js';
import { REPO } from './helpers/cli.js';

const README = readFileSync(join(REPO, 'README.md'), 'utf8');

/** Every command's full help as printed by `stackwright CMD --help`, the text after the options included. */
async function helpTexts(): Promise<Record<string, string>> {
  const program = await buildProgram(['node', 'stackwright']);
  const out: Record<string, string> = {};
  for (const cmd of [program, ...program.commands]) {
    let text = '';
    cmd.configureOutput({ writeOut: (s) => (text += s), writeErr: (s) => (text += s) });
    cmd.outputHelp();
    out[cmd.name()] = text;
  }
  return out;
}

// Example model names follow one vendor family's convention when they read nch/pch (with suffixes); project rule:
// neutral names of our own (nfet_model, pfet_model).
const VENDOR_STYLE = /\b[np]ch(?:_\w+)?\b/;

describe('names in examples', () => {
  it('README and every help text use neutral example model names (nfet_model, pfet_model)', async () => {
    expect(README.match(VENDOR_STYLE)?.[0]).toBeUndefined();
    expect(README).toContain('--model nfet_model');
    const helps = await helpTexts();
    expect(Object.keys(helps)).toContain('characterise');
    for (const [name, text] of Object.entries(helps)) expect(text.match(VENDOR_STYLE)?.[0], `help of ${name}`).toBeUndefined();
    expect(helps.characterise).toContain('nfet_model');
    expect(helps.netlist).toContain('--model-n nfet_model --model-p pfet_model');
  });

  it('README shows the characterisation round trip: deck, ngspice run, ingest of the file it wrote', () => {
    const deck = /^stackwright characterise [^\n]*--deck (\S+)\.cir$/m.exec(README);
    expect(deck).not.toBeNull();
    const base = deck![1];
    const run = README.indexOf(`ngspice -b ${base}.cir`);
    const ingest = README.indexOf(`stackwright ingest ${base}.dat`);
    expect(run).toBeGreaterThan(deck!.index);
    expect(ingest).toBeGreaterThan(run);
  });
});
