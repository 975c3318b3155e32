#!/usr/bin/env python3
"""Reference values for tests/table.test.ts and tests/device.test.ts.

Run once, commit the output:  python3 scripts/scipy-reference.py
Writes tests/fixtures/scipy/grid-4d.json and tests/fixtures/scipy/slice-scheme.json.
All data are random or invented analytic functions, not any real process.

(a) grid-4d: scipy.interpolate.RegularGridInterpolator(method='linear') on a
    random 4-D grid (three non-uniform axes, one uniform), ~200 in-range queries.
(b) slice-scheme: an independent numpy implementation of the device-slice scheme
    documented in src/device/slice.ts, written as compositions of 1-D np.interp calls:
    across L ln(value) vs ln(L) (linear in ln L when a neighbour is <= 0);
    within a length bilinear in (vds, vsb), then along VGS ln(value) for
    id/gm/gds/gmb when both neighbours are > 0, linear otherwise; capacitances linear.
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy.interpolate import RegularGridInterpolator

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, '..', 'tests', 'fixtures', 'scipy')
rng = np.random.default_rng(20240607)


def versions():
    return {'scipy': scipy.__version__, 'numpy': np.__version__, 'python': sys.version.split()[0]}


def grid_case():
    axes = [
        np.sort(rng.uniform(0.0, 2.0, 5)),
        np.cumsum(rng.uniform(0.1, 1.0, 4)) - 3.0,
        np.sort(rng.uniform(1e-7, 2e-6, 6)),
        np.linspace(-0.5, 0.5, 3),  # uniform: exercises the fast index path
    ]
    shape = tuple(len(a) for a in axes)
    values = rng.uniform(1.0, 3.0, shape)
    pts = np.column_stack([rng.uniform(a[0], a[-1], 200) for a in axes])
    # A few points exactly on nodes and edges.
    extra = np.array([[a[i % len(a)] for a in axes] for i in range(6)] +
                     [[a[-1] for a in axes], [a[0] for a in axes]])
    pts = np.vstack([pts, extra])
    interp = RegularGridInterpolator(axes, values, method='linear', bounds_error=True)
    return {
        'axes': [a.tolist() for a in axes],
        'values': values.ravel(order='C').tolist(),
        'points': pts.tolist(),
        'expected': interp(pts).tolist(),
    }


# ---- (b) synthetic device table (invented, EKV-flavoured shapes) ----
LOG_Q = {'id', 'gm', 'gds', 'gmb'}


def synthetic_table():
    l = np.array([1e-7, 2.5e-7, 1e-6])
    vgs = np.linspace(0.0, 1.2, 13)
    vds = np.array([0.05, 0.3, 0.8, 1.2])
    vsb = np.array([0.0, 0.3, 0.6])
    L, G, D, S = np.meshgrid(l, vgs, vds, vsb, indexing='ij')
    n, ut = 1.3, 0.02585
    vt = 0.42 + 0.15 * (np.sqrt(0.7 + S) - np.sqrt(0.7)) - 0.02 * (1e-7 / L)
    f = np.log1p(np.exp((G - vt) / (2 * n * ut))) ** 2
    beta = 3e-4 * (1e-6 / L)
    lam = 0.08 * (1e-7 / L) ** 0.7
    idv = 2 * n * beta * ut ** 2 * f * (1 + lam * D) * (1 - np.exp(-D / ut)) + 1e-13
    gm = idv / (n * ut) * (1 - np.exp(-np.sqrt(f))) / np.maximum(np.sqrt(f), 1e-9) + 1e-14
    # gds is mixed-sign at some nodes (as noisy data can be) to exercise the linear fallback.
    gds = lam * idv / (1 + lam * D) + 2e-9 * np.sin(7 * G + 3 * D) - 1e-9
    gmb = 0.25 * gm / np.sqrt(0.7 + S)
    cgg = 1e-15 * (L / 1e-7) * (0.6 + 0.4 / (1 + np.exp(-(G - vt) / 0.05)))
    data = {'id': idv, 'gm': gm, 'gds': gds, 'gmb': gmb, 'cgg': cgg}
    return {'l': l, 'vgs': vgs, 'vds': vds, 'vsb': vsb}, data


def cell(ax, x):
    i = int(np.searchsorted(ax, x, side='right')) - 1
    return min(max(i, 0), len(ax) - 2)


def across_l(col, lax, x):
    j = cell(lax, x)
    a, b = col[j], col[j + 1]
    xs = np.log(lax[j:j + 2])
    if a > 0 and b > 0:
        return float(np.exp(np.interp(np.log(x), xs, np.log([a, b]))))
    return float(np.interp(np.log(x), xs, [a, b]))


def slice_value(q, arr, axes, L, vg, vd, vs):
    g = cell(axes['vgs'], vg)
    at_vgs = []
    for gi in (g, g + 1):
        rows = []
        for di in range(len(axes['vds'])):
            cols = [across_l(arr[:, gi, di, si], axes['l'], L) for si in range(len(axes['vsb']))]
            rows.append(np.interp(vs, axes['vsb'], cols))
        at_vgs.append(float(np.interp(vd, axes['vds'], rows)))
    v0, v1 = at_vgs
    xs = axes['vgs'][g:g + 2]
    if q in LOG_Q and v0 > 0 and v1 > 0:
        return float(np.exp(np.interp(vg, xs, np.log([v0, v1]))))
    return float(np.interp(vg, xs, [v0, v1]))


def slice_case():
    axes, data = synthetic_table()
    lax = axes['l']
    queries = []
    for k in range(60):
        j = k % 2
        L = float(np.exp(rng.uniform(np.log(lax[j]), np.log(lax[j + 1]))))
        queries.append([L, rng.uniform(0, 1.2), rng.uniform(0.05, 1.2), rng.uniform(0, 0.6)])
    for k in range(9):  # at table lengths, and one on all-node coordinates
        queries.append([float(lax[k % 3]), rng.uniform(0, 1.2), rng.uniform(0.05, 1.2), rng.uniform(0, 0.6)])
    queries.append([float(lax[1]), float(axes['vgs'][5]), float(axes['vds'][2]), float(axes['vsb'][1])])
    expected = {q: [slice_value(q, arr, axes, *p) for p in queries] for q, arr in data.items()}
    return {
        'note': 'invented synthetic table, not a real process',
        'referenceWidth': 1e-6,
        'axes': {k: v.tolist() for k, v in axes.items()},
        'data': {q: arr.ravel(order='C').tolist() for q, arr in data.items()},
        'queries': queries,
        'expected': expected,
    }


def write(name, obj):
    obj = {'generator': 'scripts/scipy-reference.py', **versions(), **obj}
    with open(os.path.join(OUT, name), 'w') as fh:
        json.dump(obj, fh, indent=None, separators=(',', ':'))
        fh.write('\n')
    print('wrote', name, 'with scipy', scipy.__version__)


if __name__ == '__main__':
    os.makedirs(OUT, exist_ok=True)
    write('grid-4d.json', grid_case())
    write('slice-scheme.json', slice_case())
