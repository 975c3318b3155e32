import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import * as fs from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { StackwrightError } from '../src/errors.js';
import {
  RegularGridInterpolator, clearTableCache, kitInventory, listKits, loadTable, readTable, tablePath, writeTable,
} from '../src/table/index.js';
import type { DeviceTable, Polarity } from '../src/table/index.js';
import gridRef from './fixtures/scipy/grid-4d.json' with { type: 'json' };

// Lets one test make the disk "fail" halfway through a write.
const failWrite = vi.hoisted(() => ({ on: false }));
vi.mock('node:fs', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs')>();
  const writeSync = ((fd: number, buf: Uint8Array, off?: number, len?: number, pos?: number) => {
    if (failWrite.on) {
      const half = Math.floor((len ?? buf.length) / 2);
      real.writeSync(fd, buf, off ?? 0, half, pos);
      throw new Error('EIO: simulated disk failure');
    }
    return real.writeSync(fd, buf, off, len, pos);
  }) as typeof real.writeSync;
  return { ...real, writeSync, default: { ...real, writeSync } };
});

const dirs: string[] = [];
function tmp(): string {
  const d = mkdtempSync(join(tmpdir(), 'sw-table-'));
  dirs.push(d);
  return d;
}
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

const f64 = (a: number[]): Float64Array => Float64Array.from(a);

/** Small invented table from an analytic function (not process data). */
function makeTable(kit = 'testkit', device: Polarity = 'n', corner = 'tt', scale = 1): DeviceTable {
  const axes = { l: f64([1e-7, 3e-7, 1e-6]), vgs: f64([0, 0.3, 0.6, 0.9, 1.2]), vds: f64([0.1, 0.6, 1.2]), vsb: f64([0, 0.4]) };
  const n = 3 * 5 * 3 * 2;
  const id = new Float64Array(n);
  const gm = new Float64Array(n);
  const cgg = new Float64Array(n);
  let k = 0;
  for (const l of axes.l) for (const g of axes.vgs) for (const d of axes.vds) for (const s of axes.vsb) {
    id[k] = scale * 1e-5 * (1e-7 / l) * Math.exp(g - 0.2 * s) * (1 + 0.1 * d);
    gm[k] = id[k] * (1 + Math.sin(k)); // arbitrary, includes -0-ish values near zero
    cgg[k] = 1e-15 * (l / 1e-7) + k * 1e-18;
    k++;
  }
  gm[7] = -0; // sign of zero must survive the round trip
  gm[8] = 5e-324; // smallest subnormal too
  return {
    meta: {
      format: 'stackwright-table', version: 1, kit, device, corner, temperature: 27, referenceWidth: 1e-6,
      sources: [{ file: 'sweeps/n.csv', sha256: 'ab'.repeat(32), rows: 90 }],
      derived: { cgg: 'invented for the test' },
      units: { l: 'm', vgs: 'V', vds: 'V', vsb: 'V', id: 'A', gm: 'S', cgg: 'F' },
      note: 'invented test data, not a real process',
      mismatch: { avt: 5e-9, abeta: 1e-8 },
    },
    axes,
    data: { id, gm, cgg },
  };
}

function bits(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

describe('RegularGridInterpolator', () => {
  const axes = gridRef.axes;
  const grid = new RegularGridInterpolator(axes, gridRef.values);

  it(`matches SciPy ${gridRef.scipy} RegularGridInterpolator(method='linear') to 1e-12`, () => {
    // Source: tests/fixtures/scipy/grid-4d.json from scripts/scipy-reference.py (SciPy).
    expect(gridRef.points.length).toBeGreaterThan(200);
    gridRef.points.forEach((p, i) => {
      const got = grid.interpolate(p);
      expect(Math.abs(got - gridRef.expected[i]) / Math.abs(gridRef.expected[i])).toBeLessThan(1e-12);
    });
  });

  it('batched queries equal SciPy too and write into the given array', () => {
    // Source: same SciPy fixture.
    const pts = Float64Array.from(gridRef.points.flat());
    const out = new Float64Array(gridRef.points.length);
    const res = grid.interpolateBatch(pts, out);
    expect(res).toBe(out);
    out.forEach((v, i) => expect(Math.abs(v - gridRef.expected[i]) / gridRef.expected[i]).toBeLessThan(1e-12));
  });

  it('reproduces every grid value exactly', () => {
    // Interpolants pass through their data points (definition; SciPy docs for RegularGridInterpolator).
    const [a0, a1, a2, a3] = axes;
    let k = 0;
    for (const x0 of a0) for (const x1 of a1) for (const x2 of a2) for (const x3 of a3) {
      expect(grid.interpolate([x0, x1, x2, x3])).toBe(gridRef.values[k++]);
    }
  });

  it('reproduces affine functions (multilinear interpolation is exact for them)', () => {
    // Handbook fact: multilinear interpolation reproduces polynomials of degree <= 1 in each variable.
    const xs = [0, 0.5, 2, 3.5];
    const ys = [-1, 0, 4];
    const f = (x: number, y: number): number => 2 + 3 * x - 0.5 * y + 0.25 * x * y;
    const g = new RegularGridInterpolator([xs, ys], xs.flatMap((x) => ys.map((y) => f(x, y))));
    fc.assert(fc.property(fc.double({ min: 0, max: 3.5, noNaN: true }), fc.double({ min: -1, max: 4, noNaN: true }), (x, y) => {
      expect(g.interpolate([x, y])).toBeCloseTo(f(x, y), 12);
    }));
  });

  it('stays within the values of the enclosing cell', () => {
    // Multilinear weights are a convex combination of the cell corners (common practice).
    const [a0, a1, a2, a3] = axes;
    const dims = axes.map((a) => a.length);
    const cellOf = (a: number[], x: number): number => {
      let i = 0;
      while (i < a.length - 2 && x > a[i + 1]) i++;
      return i;
    };
    const arb = axes.map((a) => fc.double({ min: a[0], max: a[a.length - 1], noNaN: true }));
    fc.assert(fc.property(arb[0], arb[1], arb[2], arb[3], (x0, x1, x2, x3) => {
      const c = [cellOf(a0, x0), cellOf(a1, x1), cellOf(a2, x2), cellOf(a3, x3)];
      let lo = Infinity;
      let hi = -Infinity;
      for (let m = 0; m < 16; m++) {
        const ix = c.map((ci, d) => ci + ((m >> d) & 1));
        const v = gridRef.values[((ix[0] * dims[1] + ix[1]) * dims[2] + ix[2]) * dims[3] + ix[3]];
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
      const v = grid.interpolate([x0, x1, x2, x3]);
      expect(v).toBeGreaterThanOrEqual(lo - 1e-15 * hi);
      expect(v).toBeLessThanOrEqual(hi + 1e-15 * hi);
    }), { numRuns: 300 });
    void a3;
  });

  it('refuses out-of-range points naming the axis, value and range, or gives NaN when asked', () => {
    // Rule of DEVELOPERS.md: never extrapolate silently.
    const g = new RegularGridInterpolator([[0, 1], [10, 20, 30]], [1, 2, 3, 4, 5, 6], { names: ['vgs', 'vds'], units: ['V', 'V'] });
    expect(() => g.interpolate([0.5, 31])).toThrow(/vds = 31 V is outside the table range \[10 V, 30 V\]/);
    try {
      g.interpolate([-0.1, 15]);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(StackwrightError);
      expect((e as StackwrightError).kind).toBe('range');
      expect((e as Error).message).toMatch(/^vgs = -100 mV/);
    }
    expect(() => g.interpolate([NaN, 15])).toThrow(/vgs/);
    const lax = new RegularGridInterpolator([[0, 1], [10, 20, 30]], [1, 2, 3, 4, 5, 6], { outOfBounds: 'nan' });
    expect(lax.interpolate([2, 15])).toBeNaN();
    expect(lax.interpolate([0.5, 15])).toBeCloseTo(3, 14); // halfway between 2 and 5
  });

  it('validation messages name the dimension', () => {
    expect(() => new RegularGridInterpolator([[0, 1], [1]], [1, 2])).toThrow(/dimension 1 needs at least 2 points/);
    expect(() => new RegularGridInterpolator([[0, 1], [2, 2]], [1, 2, 3, 4])).toThrow(/dimension 1 is not strictly increasing at point 1/);
    expect(() => new RegularGridInterpolator([[0, 1], [1, 2]], [1, 2, 3], { names: ['vgs', 'vds'] })).toThrow(/3 entries .*2×2.* need 4/);
    expect(() => new RegularGridInterpolator([[0, NaN]], [1, 2], { names: ['vds'] })).toThrow(/dimension 0 \(vds\) point 1 is not a finite number/);
    expect(() => new RegularGridInterpolator([[0, 1]], [1, 2]).interpolateBatch(new Float64Array(3).fill(0.5), new Float64Array(2))).toThrow(/holds 2 values/);
  });
});

describe('table store', () => {
  it('round-trips bit-exactly through the .swtab format', () => {
    const dir = tmp();
    const t = makeTable();
    const path = writeTable(dir, t);
    expect(path).toBe(join(dir, 'testkit', 'n-tt.swtab'));
    expect(tablePath(dir, 'testkit', 'n', 'tt')).toBe(path);
    const back = readTable(path);
    expect(back.meta).toEqual(t.meta);
    for (const a of ['l', 'vgs', 'vds', 'vsb'] as const) expect(bits(back.axes[a])).toBe(bits(t.axes[a]));
    expect(Object.keys(back.data).sort()).toEqual(['cgg', 'gm', 'id']);
    expect(bits(back.data.id)).toBe(bits(t.data.id));
    expect(bits(back.data.gm as Float64Array)).toBe(bits(t.data.gm as Float64Array));
    expect(Object.is(back.data.gm![7], -0)).toBe(true);
  });

  it('lays the file out as magic line, JSON header line, zero padding to 8 bytes, little-endian float64', () => {
    // Reads the bytes with Node's Buffer.readDoubleLE (IEEE 754 binary64), independent of our decoder.
    const dir = tmp();
    const t = makeTable();
    const raw = readFileSync(writeTable(dir, t));
    const nl1 = raw.indexOf(10);
    const nl2 = raw.indexOf(10, nl1 + 1);
    expect(raw.subarray(0, nl1).toString()).toBe('stackwright-table 1');
    const header = JSON.parse(raw.subarray(nl1 + 1, nl2).toString());
    expect(header.meta.kit).toBe('testkit');
    expect(header.axes.vgs).toEqual([0, 0.3, 0.6, 0.9, 1.2]);
    const start = Math.ceil((nl2 + 1) / 8) * 8;
    for (let i = nl2 + 1; i < start; i++) expect(raw[i]).toBe(0);
    const { offset, length } = header.layout.id;
    expect(length).toBe(90);
    expect(raw.readDoubleLE(start + offset + 8 * 17)).toBe(t.data.id[17]);
    const g = header.layout.gm;
    expect(raw.readDoubleLE(start + g.offset + 8 * 8)).toBe(5e-324);
    expect(raw.length).toBe(start + 3 * 90 * 8);
  });

  it('refuses to overwrite without force, naming the path and --force', () => {
    const dir = tmp();
    const path = writeTable(dir, makeTable());
    try {
      writeTable(dir, makeTable('testkit', 'n', 'tt', 2));
      expect.unreachable();
    } catch (e) {
      expect((e as StackwrightError).kind).toBe('exists');
      expect((e as Error).message).toContain(path);
      expect((e as Error).message).toContain('--force');
    }
    writeTable(dir, makeTable('testkit', 'n', 'tt', 2), { force: true });
    expect(readTable(path).data.id[0]).toBe(2 * 1e-5 * 1 * Math.exp(0) * (1 + 0.1 * 0.1)); // scale 2 of makeTable's formula
  });

  it('a write that fails midway leaves the old file untouched and no temp file', () => {
    const dir = tmp();
    const path = writeTable(dir, makeTable());
    const before = readFileSync(path);
    failWrite.on = true;
    try {
      expect(() => writeTable(dir, makeTable('testkit', 'n', 'tt', 3), { force: true })).toThrow(/simulated disk failure/);
    } finally {
      failWrite.on = false;
    }
    expect(readFileSync(path).equals(before)).toBe(true);
    expect(readdirSync(join(dir, 'testkit'))).toEqual(['n-tt.swtab']);
  });

  it('rejects corrupt files with one-line errors naming the file', () => {
    const dir = tmp();
    const good = readFileSync(writeTable(dir, makeTable()));
    const nl1 = good.indexOf(10);
    const nl2 = good.indexOf(10, nl1 + 1);
    const header = good.subarray(nl1 + 1, nl2).toString();
    const cases: Array<[string, Buffer, RegExp]> = [
      ['magic', Buffer.concat([Buffer.from('not-a-table 1'), good.subarray(nl1)]), /not a stackwright table/],
      ['version', Buffer.concat([Buffer.from('stackwright-table 9'), good.subarray(nl1)]), /"stackwright-table 9" is not supported/],
      ['truncated', good.subarray(0, good.length - 12), /truncated: the data blocks need \d+ bytes, the file has \d+/],
      ['trailing', Buffer.concat([good, Buffer.alloc(8)]), /8 unexpected bytes/],
      ['json', Buffer.concat([good.subarray(0, nl1 + 1), Buffer.from('{"meta":'), good.subarray(nl2)]), /line 2\) is not valid JSON/],
      ['no newline', good.subarray(0, nl1 + 20), /header line is not terminated/],
      ['axis', Buffer.from(good.toString('latin1').replace('"vgs":[0,0.3,', '"vgs":[0,0.0,'), 'latin1'), /axis vgs is not strictly increasing at point 1/],
      ['block size', Buffer.from(good.toString('latin1').replace('"length":90', '"length":80'), 'latin1'), /block id holds 80 values, the axes need 90/],
    ];
    expect(header).toContain('"layout"');
    for (const [name, bytes, re] of cases) {
      const p = join(dir, `bad-${name.replace(' ', '-')}.swtab`);
      writeFileSync(p, bytes);
      try {
        readTable(p);
        expect.unreachable(name);
      } catch (e) {
        expect(e, name).toBeInstanceOf(StackwrightError);
        const msg = (e as Error).message;
        expect(msg, name).toMatch(re);
        expect(msg.startsWith(p + ': '), name).toBe(true);
        expect(msg.includes('\n'), name).toBe(false);
      }
    }
    expect(() => readTable(join(dir, 'absent.swtab'))).toThrow(/absent\.swtab: cannot read table: ENOENT/);
  });

  it('loads by name with a cache, lists kits, and says what exists when something is missing', () => {
    const dir = tmp();
    writeTable(dir, makeTable('kitA', 'n', 'tt'));
    writeTable(dir, makeTable('kitA', 'p', 'ss'));
    writeTable(dir, makeTable('kitB', 'n', 'ff'));
    mkdirSync(join(dir, 'empty'));
    clearTableCache();
    expect(listKits(dir)).toEqual(['kitA', 'kitB']);
    const a = loadTable(dir, 'kitA', 'n', 'tt');
    expect(loadTable(dir, 'kitA', 'n', 'tt')).toBe(a);
    expect(() => loadTable(dir, 'kitA', 'n', 'ff')).toThrow(/kit "kitA" .* has no table for device n, corner ff; it has: n-tt, p-ss/);
    expect(() => loadTable(dir, 'kitC', 'n', 'tt')).toThrow(/no kit "kitC" .*kits there: kitA, kitB/);
    expect(() => listKits(join(dir, 'nowhere'))).toThrow(/does not exist/);
    // A file renamed by hand no longer matches its header.
    fs.copyFileSync(tablePath(dir, 'kitA', 'n', 'tt'), join(dir, 'kitA', 'n-ff.swtab'));
    expect(() => loadTable(dir, 'kitA', 'n', 'ff')).toThrow(/does not match the file name/);
  });

  it('inventories kits from the headers', () => {
    const dir = tmp();
    writeTable(dir, makeTable('kitA', 'n', 'tt'));
    writeTable(dir, makeTable('kitA', 'p', 'ss'));
    const inv = kitInventory(dir);
    expect(inv.map((k) => k.kit)).toEqual(['kitA']);
    expect(inv[0].tables.map((t) => `${t.device}-${t.corner}`)).toEqual(['n-tt', 'p-ss']);
    const t = inv[0].tables[0];
    expect(t.l).toEqual({ min: 1e-7, max: 1e-6, values: [1e-7, 3e-7, 1e-6] });
    expect(t.vgs).toEqual([0, 1.2]);
    expect(t.vds).toEqual([0.1, 1.2]);
    expect(t.vsb).toEqual([0, 0.4]);
    expect(t.stored).toEqual(['id', 'gm', 'cgg']);
    expect(t.derived).toEqual({ cgg: 'invented for the test' });
    expect(t.sources[0].rows).toBe(90);
    expect(t.temperature).toBe(27);
    expect(t.note).toMatch(/invented/);
    expect(t.mismatch).toEqual({ avt: 5e-9, abeta: 1e-8 });
    expect(t.points).toBe(90);
  });

  it('refuses to write an inconsistent table', () => {
    const dir = tmp();
    const t = makeTable();
    t.data.gm = new Float64Array(5);
    expect(() => writeTable(dir, t)).toThrow(/quantity gm has 5 values, the axes need 90/);
    const u = makeTable('bad/kit');
    expect(() => writeTable(dir, u)).toThrow(/meta\.kit "bad\/kit" is not a plain name/);
    const v = makeTable();
    v.data.id[3] = NaN;
    expect(() => writeTable(dir, v)).toThrow(/quantity id is not finite at l=1e-7 vgs=0 vds=0.6 vsb=0.4/);
  });
});
