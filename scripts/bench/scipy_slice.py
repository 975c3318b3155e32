"""The lookups `probe` and `size` make (src/device/slice.ts), done with NumPy and
SciPy: the plane at length L merged log-log from its two table lengths, then per
query bilinear in (vds, vsb) at the two VGS neighbours (RegularGridInterpolator,
method='linear', evaluated on the VGS nodes) and geometric along VGS when both
are > 0, linear otherwise. Reads the files written by slice-lookups.ts, times
the queries (the plane is built once, untimed, as the slice is on the node side),
writes the results as raw float64 (n x 4: jd, gm, gds, gmb per metre) and prints
one JSON line."""
import json
import sys
import time

import numpy as np
from scipy import __version__ as scipy_version
from scipy.interpolate import RegularGridInterpolator

QUANTITIES = ('id', 'gm', 'gds', 'gmb')


def plane(meta, blocks):
    l0, l1 = meta['l']
    s = np.log(meta['L'] / l0) / np.log(l1 / l0)
    out = []
    for a, b in blocks:
        with np.errstate(divide='ignore', invalid='ignore'):
            geo = np.exp((1 - s) * np.log(a) + s * np.log(b))
        out.append(np.where((a > 0) & (b > 0), geo, (1 - s) * a + s * b))
    return np.stack(out, axis=-1)  # (nvgs, nvds, nvsb, 4)


def lookups(rgi, vgs, pts, width):
    vg, vd, vs = pts[:, 0], pts[:, 1], pts[:, 2]
    g = np.clip(np.searchsorted(vgs, vg, side='right') - 1, 0, len(vgs) - 2)
    t = ((vg - vgs[g]) / (vgs[g + 1] - vgs[g]))[:, None]
    lo = rgi(np.column_stack([vgs[g], vd, vs]))
    hi = rgi(np.column_stack([vgs[g + 1], vd, vs]))
    with np.errstate(divide='ignore', invalid='ignore'):
        geo = lo * np.exp(t * np.log(hi / lo))
    return np.where((lo > 0) & (hi > 0), geo, (1 - t) * lo + t * hi) / width


def main():
    meta_path, data_path, pts_path, out_path, runs = sys.argv[1:6]
    meta = json.load(open(meta_path))
    ng, nd, ns = len(meta['vgs']), len(meta['vds']), len(meta['vsb'])
    raw = np.fromfile(data_path, '<f8').reshape(len(QUANTITIES), 2, ng, nd, ns)
    pts = np.fromfile(pts_path, '<f8').reshape(-1, 3)
    vgs = np.asarray(meta['vgs'])
    rgi = RegularGridInterpolator((vgs, np.asarray(meta['vds']), np.asarray(meta['vsb'])),
                                  plane(meta, [(raw[k, 0], raw[k, 1]) for k in range(len(QUANTITIES))]), method='linear')
    res = lookups(rgi, vgs, pts, meta['referenceWidth'])  # one warm-up, as on the node side
    times = []
    for _ in range(int(runs)):
        t0 = time.perf_counter()
        res = lookups(rgi, vgs, pts, meta['referenceWidth'])
        times.append((time.perf_counter() - t0) * 1000)
    np.ascontiguousarray(res, '<f8').tofile(out_path)
    print(json.dumps({'ms': times, 'scipy': scipy_version, 'numpy': np.__version__}))


if __name__ == '__main__':
    main()
