import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
// The package's own name, as in the README; vitest.config.ts maps it to src/index.ts so a stale dist/ cannot pass or fail this.
import { ingestFiles, loadKit, probe, sizeStack, sizeSpec, parseSpec, writeTable, CAUTION } from 'stackwright';

describe('library API, as in the README example', () => {
  it('ingest -> writeTable -> loadKit -> probe -> sizeStack', () => {
    const dir = mkdtempSync(join(tmpdir(), 'sw-api-'));
    try {
      // A square-law sweep with channel-length modulation (common practice): id = (k/2)(W/L)(vgs−vt)²(1+λ·vds),
      // saturation where vds > vov, triode below; k' = 200 µA/V², vt = 0.4 V plus body effect, λ = 0.1 µm/L per V.
      const rows = ['l,w,vgs,vds,vsb,id'];
      for (const l of [0.5e-6, 1e-6, 2e-6]) for (let g = 0; g <= 36; g++) for (let d = 0; d <= 36; d++) for (const vsb of [0, 0.3, 0.6]) {
        const vgs = g * 0.05;
        const vds = d * 0.05;
        const vt = 0.4 + 0.4 * (Math.sqrt(0.7 + vsb) - Math.sqrt(0.7));
        // a small exponential tail below threshold keeps id > 0 everywhere
        const vov = Math.max(vgs - vt, 0) + 1e-3 * Math.exp(Math.min(0, vgs - vt) / 0.04);
        const lam = (0.1e-6 / l);
        const beta = 200e-6 * (1e-6 / l);
        const ids = vds < vov ? beta * (vov * vds - vds * vds / 2) : (beta / 2) * vov * vov;
        rows.push(`${l},1e-6,${vgs},${vds},${vsb},${(ids * (1 + lam * vds)).toExponential(8)}`);
      }
      const csv = join(dir, 'sq.csv');
      writeFileSync(csv, rows.join('\n') + '\n');
      const table = ingestFiles([csv], { kit: 'sq', device: 'n', corner: 'tt' });
      writeTable(dir, table, { force: true });
      const kit = loadKit('sq', { tables: dir });
      const op = probe(kit.table('n', 'tt'), { l: 1e-6, vgs: 0.8, vds: 1.0 });
      // Square law in saturation: gm = 2·ID/Vov (common practice); Vov = 0.4 V here.
      expect(op.gm / (2 * op.id / 0.4)).toBeCloseTo(1, 1);
      const spec = parseSpec('kit: sq\nsupply: 1.8\nstacks:\n  - {name: s, device: n, topology: cascode, current: 20u, rout: 5meg, headroom: 0.9, span: 1.7}\n', 'api.yaml');
      const one = sizeStack(spec.stacks[0], kit, { supply: spec.supply, corners: ['tt'] });
      expect(one.results[0].feasible).toBe(true);
      const { result } = sizeSpec(spec, kit);
      expect(result.caution).toBe(CAUTION);
      expect(result.stacks[0].predicted.rout).toBeGreaterThanOrEqual(5e6);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
