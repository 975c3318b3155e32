/**
 * demo-tables/README.md, generated so it always matches the invented kits of the
 * fictional foundry "Larkspur Microsystems" (not a real process).
 */
import { sweepVolts } from './csv.js';
import { DEMO_KITS, FOUNDRY, SYNTH_VERSION } from './kits.js';

function kitSection(name: string): string {
  const k = DEMO_KITS[name];
  const lengths = k.lengthsNm.map((nm) => (nm / 1000).toString()).join(', ');
  const nv = sweepVolts(k.supply, k.vgsStepMv).length;
  const nd = sweepVolts(k.supply, k.vdsStepMv).length;
  const corners = Object.entries(k.corners)
    .map(([c, d]) => `\`${c}\` ${d.temperature} °C (VT ${d.dvt >= 0 ? '+' : ''}${d.dvt * 1000} mV, mobility ×${d.muFactor})`)
    .join('; ');
  return [
    `### ${k.kit}`,
    '',
    `- Supply ${k.supply} V, minimum L ${k.lmin * 1e6} µm, reference width W = ${k.w * 1e6} µm.`,
    `- Lengths (µm): ${lengths}.`,
    `- VGS and VDS: 0 to ${k.supply} V in ${k.vgsStepMv} mV steps (${nv} × ${nd} points); |VSB|: ${k.vsbMv.map((v) => v / 1000).join(', ')} V.`,
    `- |VT0| ${k.devices.n.vt0} V (n), ${k.devices.p.vt0} V (p); corners: ${corners}.`,
    `- Invented Pelgrom coefficients: A_VT ${k.mismatch.n.avt_mV_um} mV·µm (n), ${k.mismatch.p.avt_mV_um} mV·µm (p); ` +
      `A_β ${k.mismatch.n.abeta_pct_um} %·µm (n), ${k.mismatch.p.abeta_pct_um} %·µm (p).`,
    '',
  ].join('\n');
}

export function synthReadme(): string {
  return [
    '# Demo tables (INVENTED data)',
    '',
    `Everything in this folder is invented for demonstration. "${FOUNDRY}" is a fictional foundry and its two`,
    'kits, `demo180` and `demo090`, are not real processes: the sweeps come from a smooth EKV-style model',
    `(stackwright synth v${SYNTH_VERSION}, \`src/synth\`) with made-up parameters. Do not use them to design real circuits.`,
    '',
    'The scenario: a design made in the older 1.8 V `demo180` kit is ported to the 1.2 V `demo090` kit, whose',
    'thinner oxide, lower threshold, stronger DIBL, shorter Early voltage and stronger velocity saturation make',
    'high output resistance at low headroom harder to reach.',
    '',
    '## Files',
    '',
    '- `<kit>/kit.json`: supply, lengths, sweep, model parameters, corners, invented mismatch coefficients.',
    '- `<kit>/<device>-<corner>.csv.gz`: gzip-compressed CSV, `device` is `n` or `p`, `corner` is `tt`, `ss` or `ff`.',
    '',
    'Each CSV starts with `#` comment lines (invented-data label, kit, device, corner, temperature, generator),',
    'then the header `l,w,vgs,vds,vsb,id,gm,gds,gmb,cgg,cgs,cgd,cdd` and one row per bias point, SI units',
    '(m, V, A, S, F), six significant digits. Rows are ordered by l, then vgs, vds, vsb (vsb fastest).',
    '',
    '## Sign conventions',
    '',
    'Values are written with the signs a simulator reports:',
    '',
    '- NMOS: vgs, vds, vsb ≥ 0 and id ≥ 0 (current into the drain).',
    '- PMOS: vgs ≤ 0, vds ≤ 0, id ≤ 0, and vsb = vs − vb ≤ 0 (the source sits below its n-well bulk).',
    '- gm, gds, gmb and the capacitances are positive for both (gmb = ∂|id|/∂|vbs|).',
    '- Capacitances: cgg = ∂Qg/∂Vg; cgs, cgd are the gate-source and gate-drain parts (intrinsic plus overlap);',
    '  cdd = ∂Qd/∂Vd including the drain junction.',
    '',
    '## Kits',
    '',
    ...Object.keys(DEMO_KITS).map(kitSection),
    '## Regenerating',
    '',
    '`npx tsx scripts/synth-demo.ts [outDir] [--force]` writes the same files again (the output is deterministic).',
    '',
  ].join('\n');
}
