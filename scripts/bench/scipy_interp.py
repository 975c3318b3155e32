"""Time SciPy's RegularGridInterpolator(method='linear') on the grid and points
written by grid-file.ts; write its results (raw float64) and print one JSON line."""
import json
import sys
import time

import numpy as np
from scipy import __version__ as scipy_version
from scipy.interpolate import RegularGridInterpolator


def read_grid(path):
    raw = open(path, 'rb').read()
    ndim, npoints = np.frombuffer(raw, '<i4', 2)
    sizes = np.frombuffer(raw, '<i4', ndim, 8)
    off = 8 + 4 * ndim
    axes = []
    for n in sizes:
        axes.append(np.frombuffer(raw, '<f8', n, off))
        off += 8 * n
    values = np.frombuffer(raw, '<f8', int(np.prod(sizes)), off).reshape(tuple(sizes))
    off += values.nbytes
    points = np.frombuffer(raw, '<f8', npoints * ndim, off).reshape(npoints, ndim)
    return axes, values, points


def main():
    grid_path, out_path, runs = sys.argv[1], sys.argv[2], int(sys.argv[3])
    axes, values, points = read_grid(grid_path)
    interp = RegularGridInterpolator(axes, values, method='linear')
    result = interp(points)  # one warm-up, as on the node side
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        result = interp(points)
        times.append((time.perf_counter() - t0) * 1000)
    np.asarray(result, '<f8').tofile(out_path)
    print(json.dumps({'ms': times, 'scipy': scipy_version, 'numpy': np.__version__}))


if __name__ == '__main__':
    main()
