#!/usr/bin/env python3
"""Golden eigenvalues for test/linalg/eig-golden.test.ts, computed with numpy.linalg.eig
(LAPACK dgeev underneath).

Each case stores its matrix (dense rows, or nonzero triplets for sparse circuit matrices) and the
eigenvalues numpy.linalg.eig finds for it, plus the largest eigenvalue condition number
(1/|yᴴx| for unit left/right eigenvectors, from scipy.linalg.eig) so the test can scale its
tolerance to how sensitive each eigenvalue is.

The circuit matrices are written here from Kirchhoff's laws, independently of ringdown's code:
  * RC ladder: node k has Ck to ground, Rk from node k−1 (node 0 = a grounded source) to node k.
      Ck·vk' = (v(k−1) − vk)/Rk − (vk − v(k+1))/R(k+1)
  * lossy LC ladder: series Lk with series resistance rk, shunt Ck with parallel conductance gk.
      Lk·ik' = v(k−1) − vk − rk·ik,   Ck·vk' = ik − i(k+1) − gk·vk
Run:  python3 test/golden/make_eig_golden.py   (writes test/golden/eig-golden.json)
The test suite only reads the JSON file; it never needs python.
"""
import json
import os

import numpy as np
import scipy.linalg

HERE = os.path.dirname(os.path.abspath(__file__))
rng = np.random.default_rng(20240611)


def rc_ladder(n):
    R = np.round(rng.uniform(1e3, 1e4, n), 1)
    C = np.round(rng.uniform(1e-9, 1e-7, n), 12)
    A = np.zeros((n, n))
    for k in range(n):
        A[k, k] -= 1 / R[k]
        if k > 0:
            A[k, k - 1] += 1 / R[k]
        if k + 1 < n:
            A[k, k] -= 1 / R[k + 1]
            A[k, k + 1] += 1 / R[k + 1]
        A[k, :] /= C[k]
    return A


def lc_ladder(sections):
    # state order: i1, v1, i2, v2, ...
    L = np.round(rng.uniform(1e-6, 1e-5, sections), 9)
    C = np.round(rng.uniform(1e-7, 1e-6, sections), 10)
    r = np.round(rng.uniform(0.01, 1.0, sections), 3)
    g = np.round(rng.uniform(1e-4, 1e-2, sections), 5)
    n = 2 * sections
    A = np.zeros((n, n))
    for k in range(sections):
        ik, vk = 2 * k, 2 * k + 1
        if k > 0:
            A[ik, vk - 2] += 1 / L[k]
        A[ik, vk] -= 1 / L[k]
        A[ik, ik] -= r[k] / L[k]
        A[vk, ik] += 1 / C[k]
        if k + 1 < sections:
            A[vk, ik + 2] -= 1 / C[k]
        A[vk, vk] -= g[k] / C[k]
    return A


def cond_max(A):
    w, vl, vr = scipy.linalg.eig(A, left=True, right=True)
    s = np.abs(np.sum(vl.conj() * vr, axis=0)) / (np.linalg.norm(vl, axis=0) * np.linalg.norm(vr, axis=0))
    return float(np.max(1 / s))


def case(name, A, sparse=False, note=''):
    w = np.linalg.eig(A)[0]
    order = np.lexsort((w.imag, w.real))
    w = w[order]
    out = {'name': name, 'n': A.shape[0], 'note': note, 'condMax': cond_max(A),
           're': [float(x) for x in w.real], 'im': [float(x) for x in w.imag]}
    if sparse:
        out['triplets'] = [[int(i), int(j), float(A[i, j])] for i, j in zip(*np.nonzero(A))]
    else:
        out['rows'] = [[float(x) for x in row] for row in A]
    return out


cases = []
for n in (4, 9, 24):
    A = np.round(rng.standard_normal((n, n)), 3)
    cases.append(case(f'random-{n}', A, note='standard normal entries rounded to 3 decimals'))
A = np.round(rng.standard_normal((16, 16)), 3)
A = A + A.T
cases.append(case('symmetric-16', A, note='A + Aᵀ of rounded normal entries'))
cases.append(case('rc-ladder-60', rc_ladder(60), sparse=True, note='RC ladder from KCL'))
cases.append(case('lc-ladder-60', lc_ladder(30), sparse=True, note='lossy LC ladder, 30 sections'))
# companion matrix of (x−1)(x−2)…(x−8): badly scaled rows, real well-separated roots
c = np.poly(np.arange(1, 9))
comp = np.zeros((8, 8))
comp[0, :] = -c[1:]
comp[1:, :-1] = np.eye(7)
cases.append(case('companion-8', comp, note='companion matrix of (x-1)(x-2)...(x-8)'))
# graded matrix: balancing matters
D = np.diag(2.0 ** np.arange(-20, 20, 4))
B = np.round(rng.standard_normal((10, 10)), 3)
cases.append(case('graded-10', D @ B @ np.linalg.inv(D), note='D·B·D⁻¹ with D = diag(2^-20 … 2^16)'))

path = os.path.join(HERE, 'eig-golden.json')
with open(path, 'w') as f:
    json.dump({'source': 'numpy.linalg.eig (numpy ' + np.__version__ + ')', 'cases': cases}, f, separators=(',', ':'))
print('wrote', path, os.path.getsize(path), 'bytes')
for c in cases:
    print(f"{c['name']:>14}  n={c['n']:3d}  condMax={c['condMax']:.3g}")
