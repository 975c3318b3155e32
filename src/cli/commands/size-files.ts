/**
 * The files `size` writes (front CSV and charts, netlist, HTML report), built in
 * memory. A separate module so a plain `size` never loads the chart code.
 */
import { basename, extname } from 'node:path';
import { decidingResults, type Kit, type SizeRun } from '../../api.js';
import type { DesignSpec } from '../../design/types.js';
import { frontCharts, frontCsv, reportHtml } from '../../report/size-outputs.js';
import { designNetlist } from '../../spice/netlist.js';
import { stageNetlist } from '../../spice/stage-netlist.js';
import { decidingStages } from '../../solve/stage-choose.js';
import { packageVersion } from '../io.js';
import { withCorrection, withStageCorrection } from '../../confirm/apply.js';
import type { Confirmation, StageConfirmation } from '../../confirm/index.js';
import { cornerModels } from '../../confirm/sections.js';

export interface SizeFileFlags {
  front?: string;
  netlist?: string;
  report?: string;
  /** With --spice, the decks name the models and the nominal corner's model line that simulation used. */
  spice?: boolean;
  include?: string;
  section?: Record<string, string>;
  modelN?: string;
  modelP?: string;
}

/** Models and include line of the written decks: what --spice simulated the nominal corner with, else placeholders. */
function deckModels(f: SizeFileFlags, corners: readonly string[]): { models?: { n: string; p: string }; include?: string } {
  if (!f.spice || !f.include) return {};
  return { models: { n: f.modelN ?? 'nmos_model', p: f.modelP ?? 'pmos_model' }, include: cornerModels({ include: f.include, sections: f.section }, corners[0], corners) };
}

export function sizeFiles(f: SizeFileFlags, spec: DesignSpec, specPath: string, source: string, kit: Kit, run: SizeRun, notes: readonly string[] = [], confirmations?: Confirmation[], stageConfirmations?: StageConfirmation[]): Array<[string, string]> {
  const files: Array<[string, string]> = [];
  if (f.front) {
    files.push([f.front, frontCsv(run.fronts)]);
    const stem = f.front.slice(0, f.front.length - extname(f.front).length);
    for (const [name, svg] of frontCharts(spec, run)) files.push([`${stem}.${name}.svg`, svg]);
  }
  if (f.netlist) {
    // With --spice the netlist carries the sizes simulation confirmed.
    const chosen = { ...run.result, stacks: decidingResults(run.result).map((r) => withCorrection(r, confirmations?.find((c) => c.name === r.name))) };
    const models = deckModels(f, run.result.corners);
    if (chosen.stacks.length > 0) files.push([f.netlist, designNetlist(chosen, { supply: spec.supply, specs: spec.stacks, title: `stackwright ${basename(specPath)}`, ...models })]);
    // Each stage gets its own deck beside it (its own .dc sweep of the input).
    const stem = f.netlist.slice(0, f.netlist.length - extname(f.netlist).length);
    for (const st of decidingStages(run.result)) {
      if (st.input.devices.length > 0) files.push([`${stem}.${st.name}.cir`, stageNetlist(withStageCorrection(st, stageConfirmations?.find((c) => c.name === st.name)), { supply: spec.supply, ...models })]);
    }
  }
  if (f.report) files.push([f.report, reportHtml(spec, source, kit, run, `stackwright ${packageVersion()}`, notes, confirmations, stageConfirmations)]);
  return files;
}
