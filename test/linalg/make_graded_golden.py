#!/usr/bin/env python3
"""Golden eigenvalues for test/linalg/definite-tridiagonal.test.ts: graded positive definite
tridiagonal matrices (spectra over 12 decades), computed with mpmath at 60 significant digits
(mpmath.eigsy), so that the smallest eigenvalues are known to full relative accuracy.

The matrices are scaled diagonally dominant, T = G·M·G with G = diag(ρ^(i/2)) and M = tridiag(−c, 2, −c)
(c < 1), whose eigenvalues are determined to high relative accuracy by the entries (Barlow &
Demmel, from memory): an algorithm with only absolute accuracy (ε·‖T‖) gets the small ones wrong
in every digit. The float64 entries written to the JSON are the exact input of the mpmath solve.
Run:  python3 test/linalg/make_graded_golden.py   (writes test/linalg/graded-golden.json)
"""
import json
import os

import mpmath

HERE = os.path.dirname(os.path.abspath(__file__))
mpmath.mp.dps = 60


def graded(n, rho, c, sign):
    d = [sign * 2 * rho**i for i in range(n)]
    e = [-sign * c * rho ** (i + 0.5) for i in range(n - 1)]
    return d, e


cases = []
for name, n, rho, c, sign in [
    ('graded-80 (rho 0.7)', 80, 0.7, 0.9, 1),
    ('graded-80 negative definite (rho 0.7)', 80, 0.7, 0.9, -1),
    ('graded-200 (rho 0.87, c 0.99)', 200, 0.87, 0.99, 1),
]:
    d, e = graded(n, rho, c, sign)
    T = mpmath.matrix(n, n)
    for i in range(n):
        T[i, i] = mpmath.mpf(d[i])
    for i in range(n - 1):
        T[i, i + 1] = mpmath.mpf(e[i])
        T[i + 1, i] = mpmath.mpf(e[i])
    w = mpmath.eigsy(T, eigvals_only=True)
    values = sorted(float(x) for x in w)
    cases.append({'name': name, 'd': d, 'e': e, 'values': values})

with open(os.path.join(HERE, 'graded-golden.json'), 'w') as f:
    json.dump({'source': f'mpmath {mpmath.__version__} eigsy, 60 digits', 'cases': cases}, f)
