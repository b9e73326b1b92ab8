#!/usr/bin/env python3
"""Golden eigenvalues for test/linalg/structured-golden.test.ts: circuit state matrices of the
kinds eig() routes through its structured paths (symmetrizable RC networks, ladders reordered to
tridiagonal form) and a general RLC mesh, at the sizes the benchmark uses. Computed with
numpy.linalg.eig (LAPACK dgeev); condMax is the largest eigenvalue condition number
(1/|yᴴx| for unit left/right eigenvectors, scipy.linalg.eig), as in test/golden/make_eig_golden.py.

The matrices are written here from Kirchhoff's laws, independently of ringdown's code, with
component ranges like bench/circuits.js (graded spectra: the slow poles sit far below ‖A‖), and
their states shuffled so that the ladders are not stored in ladder order.
Run:  python3 test/linalg/make_structured_golden.py   (writes test/linalg/structured-golden.json)
"""
import json
import os

import numpy as np
import scipy.linalg

HERE = os.path.dirname(os.path.abspath(__file__))
rng = np.random.default_rng(20251202)


def shuffled(A):
    p = rng.permutation(A.shape[0])
    return A[np.ix_(p, p)]


def rc_ladder(n):
    # source (grounded) -R0- n1 -R1- n2 ... n_n -Rload- ground; Ck from each node to ground
    R = rng.uniform(100, 1000, n)  # R[k] feeds node k from node k−1 (node −1 = source)
    C = rng.uniform(1e-9, 1e-8, n)
    Rload = 1e4
    G = np.zeros((n, n))
    for k in range(n):
        G[k, k] += 1 / R[k]
        if k > 0:
            G[k, k - 1] -= 1 / R[k]
            G[k - 1, k] -= 1 / R[k]
            G[k - 1, k - 1] += 1 / R[k]
    G[n - 1, n - 1] += 1 / Rload
    return -G / C[:, None]


def rc_mesh(n):
    # a random spanning tree plus n/2 chords (loops), C to ground at every node, one path to ground
    G = np.zeros((n, n))

    def link(i, j, g):
        G[i, i] += g
        G[j, j] += g
        G[i, j] -= g
        G[j, i] -= g

    for k in range(1, n):
        link(int(rng.integers(0, k)), k, 1 / rng.uniform(10, 1000))
    for _ in range(n // 2):
        i, j = rng.choice(n, 2, replace=False)
        link(int(i), int(j), 1 / rng.uniform(10, 1000))
    G[0, 0] += 1 / 10
    C = rng.uniform(1e-8, 1e-6, n)
    return -G / C[:, None]


def lc_ladder(sections):
    # source -Rs(50)- a0; section k: a(k−1) -r_k- L_k - a_k, C_k and Rp_k from a_k to ground; Rload 50
    L = rng.uniform(1e-6, 1e-5, sections)
    C = rng.uniform(1e-7, 1e-6, sections)
    r = rng.uniform(0.05, 0.55, sections)
    gp = 1 / rng.uniform(1e3, 1e4, sections)
    n = 2 * sections  # states i1, v1, i2, v2, ...
    A = np.zeros((n, n))
    for k in range(sections):
        ik, vk = 2 * k, 2 * k + 1
        rk = r[k] + (50.0 if k == 0 else 0.0)  # the source resistance in series with the first inductor
        if k > 0:
            A[ik, vk - 2] += 1 / L[k]
        A[ik, vk] -= 1 / L[k]
        A[ik, ik] -= rk / L[k]
        A[vk, ik] += 1 / C[k]
        if k + 1 < sections:
            A[vk, ik + 2] -= 1 / C[k]
        A[vk, vk] -= (gp[k] + (1 / 50 if k + 1 == sections else 0)) / C[k]
    return A


def rlc_mesh(states):
    # M capacitor nodes; a chain plus chords; the first states − M edges are R + L in series
    M = int(np.ceil(0.6 * states))
    nL = states - M
    edges = [(int(rng.integers(0, k)), k) for k in range(1, M)]
    edges += [tuple(int(x) for x in rng.choice(M, 2, replace=False)) for _ in range(int(np.ceil(M / 3)))]
    C = rng.uniform(1e-8, 1e-6, M)
    n = M + nL
    A = np.zeros((n, n))
    Gc = np.zeros((M, M))
    Gc[0, 0] += 1 / 10  # input resistor to the grounded source
    Gc[M - 1, M - 1] += 1 / 100  # load
    li = M
    for e, (a, b) in enumerate(edges):
        if e < nL:
            R = rng.uniform(1, 100)
            L = rng.uniform(1e-6, 1e-4)
            # inductor current from a to b: L·i' = va − vb − R·i; it leaves node a, enters node b
            A[li, a] += 1 / L
            A[li, b] -= 1 / L
            A[li, li] -= R / L
            A[a, li] -= 1 / C[a]
            A[b, li] += 1 / C[b]
            li += 1
        else:
            g = 1 / rng.uniform(10, 1000)
            Gc[a, a] += g
            Gc[b, b] += g
            Gc[a, b] -= g
            Gc[b, a] -= g
    A[:M, :M] -= Gc / C[:, None]
    return A


def cond_max(A):
    w, vl, vr = scipy.linalg.eig(A, left=True, right=True)
    s = np.abs(np.sum(vl.conj() * vr, axis=0)) / (np.linalg.norm(vl, axis=0) * np.linalg.norm(vr, axis=0))
    return float(np.max(1 / s))


def case(name, A, note):
    w = np.linalg.eig(A)[0]
    order = np.lexsort((w.imag, w.real))
    w = w[order]
    return {'name': name, 'n': A.shape[0], 'note': note, 'condMax': cond_max(A),
            're': [float(x) for x in w.real], 'im': [float(x) for x in w.imag],
            'triplets': [[int(i), int(j), float(A[i, j])] for i, j in zip(*np.nonzero(A))]}


cases = [
    case('rc-ladder-300', shuffled(rc_ladder(300)), 'graded RC ladder, states shuffled: symmetric tridiagonal route'),
    case('rc-mesh-80', shuffled(rc_mesh(80)), 'RC network with loops: symmetric dense route'),
    case('lc-ladder-300', shuffled(lc_ladder(150)), 'lossy LC ladder, states shuffled: tridiagonal QR + inverse iteration'),
    case('rlc-mesh-200', rlc_mesh(200), 'RLC mesh: general Hessenberg QR'),
]
with open(os.path.join(HERE, 'structured-golden.json'), 'w') as f:
    json.dump({'source': 'numpy.linalg.eig ' + np.__version__, 'cases': cases}, f)
