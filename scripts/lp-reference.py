#!/usr/bin/env python3
"""Reference answers for tests/vertex-lp.test.ts (src/numeric/vertex-lp.ts).

Run once, commit the output:  python3 scripts/lp-reference.py
Writes tests/fixtures/scipy/vertex-lp.json: random small linear programmes min c.x subject to A x <= b, shaped like
the ridge step's (1 to 5 unknowns, a few random rows through a point near 0, and a box |x_k| <= r_k), each solved
with scipy.optimize.linprog(method='highs', bounds=(None, None)); the box is part of A and b. Some are infeasible.
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy.optimize import linprog

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, '..', 'tests', 'fixtures', 'scipy')
rng = np.random.default_rng(20261204)

cases = []
for i in range(60):
    d = int(rng.integers(1, 6))
    m = int(rng.integers(1, 7))
    A = rng.normal(size=(m, d))
    # Infeasible now and then: a right-hand side far below zero for opposed rows.
    b = rng.uniform(-0.2, 1.0, size=m) if i % 7 else -np.abs(rng.uniform(1, 2, size=m))
    if i % 7 == 0:
        A = np.vstack([A, -A.sum(axis=0, keepdims=True)])
        b = np.concatenate([b, [-b.sum() - 5]])
    r = rng.uniform(0.1, 2.0, size=d)
    box_a = np.vstack([np.eye(d), -np.eye(d)])
    box_b = np.concatenate([r, r])
    A_ub = np.vstack([A, box_a])
    b_ub = np.concatenate([b, box_b])
    c = rng.normal(size=d)
    res = linprog(c, A_ub=A_ub, b_ub=b_ub, bounds=[(None, None)] * d, method='highs')
    cases.append({
        'c': c.tolist(), 'A': A_ub.tolist(), 'b': b_ub.tolist(),
        'status': int(res.status), 'value': float(res.fun) if res.status == 0 else None,
        'x': res.x.tolist() if res.status == 0 else None,
    })

# Shaped like the ridge step's programmes, where vertexLp takes the simplex path: x = 0 feasible (every b >= 0, some
# rows through it with b = 0), objective entries exactly zero for coordinates it does not need (optimal faces, not
# single vertices), rows of the box only for some coordinates pinned at zero reach.
for i in range(40):
    d = int(rng.integers(2, 6))
    m = int(rng.integers(1, 7))
    A = rng.normal(size=(m, d))
    b = np.where(rng.uniform(size=m) < 0.4, 0.0, rng.uniform(0, 0.5, size=m))
    r = np.where(rng.uniform(size=d) < 0.15, 0.0, rng.uniform(0.05, 0.5, size=d))
    A_ub = np.vstack([A, np.eye(d), -np.eye(d)])
    b_ub = np.concatenate([b, r, r])
    c = np.where(rng.uniform(size=d) < 0.4, 0.0, rng.normal(size=d))
    res = linprog(c, A_ub=A_ub, b_ub=b_ub, bounds=[(None, None)] * d, method='highs')
    cases.append({
        'c': c.tolist(), 'A': A_ub.tolist(), 'b': b_ub.tolist(),
        'status': int(res.status), 'value': float(res.fun) if res.status == 0 else None,
        'x': res.x.tolist() if res.status == 0 else None,
    })

os.makedirs(OUT, exist_ok=True)
with open(os.path.join(OUT, 'vertex-lp.json'), 'w') as f:
    json.dump({'versions': {'scipy': scipy.__version__, 'numpy': np.__version__, 'python': sys.version.split()[0]}, 'cases': cases}, f, indent=1)
print(sum(c['status'] == 0 for c in cases), 'solved,', sum(c['status'] == 2 for c in cases), 'infeasible')
