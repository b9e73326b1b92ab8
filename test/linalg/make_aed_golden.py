#!/usr/bin/env python3
"""Golden eigenvalues for test/linalg/eig-aed.test.ts from numpy.linalg.eig (LAPACK dgeev).

The matrices are sizes where the QR iteration uses aggressive early deflation (active blocks of
110 rows or more). They are not stored: each is the same linear congruential sequence as
randomMatrix() in test/linalg/matrices.ts (s ← 1664525·s + 1013904223 mod 2³², entry 2·s/2³² − 1,
exact in binary floating point), so both sides build identical matrices. Stored per case: the
eigenvalues and the largest eigenvalue condition number (1/|yᴴx| for unit left/right vectors,
scipy.linalg.eig), which scales the test tolerance.
Run:  python3 test/linalg/make_aed_golden.py   (writes test/linalg/aed-golden.json)
"""
import json
import os

import numpy as np
import scipy.linalg

HERE = os.path.dirname(os.path.abspath(__file__))


def lcg_matrix(n, seed):
    s = seed % 2**32
    a = np.empty((n, n))
    for i in range(n):
        for j in range(n):
            s = (1664525 * s + 1013904223) % 2**32
            a[i, j] = 2 * (s / 2**32) - 1
    return a


def cond_max(a):
    w, vl, vr = scipy.linalg.eig(a, left=True, right=True)
    c = 0.0
    for k in range(len(w)):
        x = vr[:, k] / np.linalg.norm(vr[:, k])
        y = vl[:, k] / np.linalg.norm(vl[:, k])
        c = max(c, 1 / abs(np.vdot(y, x)))
    return c


cases = []
for n, seed, shift in [(120, 31, 0.0), (250, 57, 0.0), (200, 91, 0.45)]:
    a = lcg_matrix(n, seed)
    # shift > 0: the upper triangle is kept and scaled (a strongly non-normal matrix with real
    # eigenvalues spread by the diagonal), the strict lower part damped to `shift` of its size
    if shift > 0:
        a = np.triu(a) + shift * np.tril(a, -1)
    w = np.linalg.eig(a)[0]
    cases.append({'n': n, 'seed': seed, 'lowerScale': shift, 'condMax': cond_max(a),
                  're': [float(x) for x in w.real], 'im': [float(x) for x in w.imag]})
with open(os.path.join(HERE, 'aed-golden.json'), 'w') as f:
    json.dump({'source': 'numpy.linalg.eig ' + np.__version__, 'cases': cases}, f)
