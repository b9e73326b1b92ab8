#!/usr/bin/env python3
"""Golden data for test/scenarios/table-golden.test.ts (tables: piecewise-linear inputs).

Each circuit is written twice, independently of ringdown's code: as a .rdn file, and as a
state-space model x' = A x + B u, y = C x + D u written here by hand from Kirchhoff's laws.
The table input is piecewise linear and every table corner is a sample time, so
scipy.signal.lsim with first-order hold (interp=True) is exact up to rounding. The script also
evaluates every sample directly with scipy.linalg.expm of the augmented matrix
[[A, B, 0], [0, 0, I], [0, 0, 0]] from the last table corner (no time stepping) and refuses to
write when the two differ by more than 1e-12 relative to the signal's peak.

Circuits:
  table-rc-ladder:     circuits/reference/table-rc-ladder.rdn (inline table)
  table-scope-current: circuits/scope-current.rdn (table file circuits/scope-current.csv)

Run: python3 test/golden/make_table_golden.py   (writes test/golden/table-*.json)
"""
import csv
import json
import os

import numpy as np
from scipy.linalg import expm
from scipy.signal import lsim

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.normpath(os.path.join(HERE, '..', '..'))


def grid(span, samples):
    return np.array([span * i / (samples - 1) for i in range(samples)])


def pwl(points, t):
    """Straight lines through the points; first value before, last value after."""
    ts = [p[0] for p in points]
    vs = [p[1] for p in points]
    return float(np.interp(t, ts, vs))


def run_lsim(A, B, C, D, x0, u, times):
    _, y, _ = lsim((A, B, C, D), u, times, X0=x0, interp=True)
    return np.asarray(y).reshape(len(times), -1)


def run_expm(A, B, C, D, x0, inputs, times):
    """inputs: list (one per input) of point lists; each input is piecewise linear.
    Exact: between consecutive corners (union of all inputs' corners) the state is
    propagated by expm of the augmented matrix."""
    n, m = A.shape[0], B.shape[1]
    corners = sorted(set([0.0] + [p[0] for pts in inputs for p in pts if 0 < p[0] < times[-1]]))
    M = np.zeros((n + 2 * m, n + 2 * m))
    M[:n, :n] = A
    M[:n, n:n + m] = B
    M[n:n + m, n + m:] = np.eye(m)

    def u_at(t):
        return np.array([pwl(pts, t) for pts in inputs])

    def slope_at(t):  # slope of the segment starting at t
        h = 1e-9 * max(1.0, times[-1])
        out = []
        for pts in inputs:
            ts = [p[0] for p in pts]
            k = np.searchsorted(ts, t, side='right')
            if k == 0 or k >= len(ts):
                out.append(0.0)
            else:
                out.append((pts[k][1] - pts[k - 1][1]) / (pts[k][0] - pts[k - 1][0]))
        return np.array(out)

    states = [np.array(x0, dtype=float)]
    for k in range(1, len(corners)):
        dt = corners[k] - corners[k - 1]
        z = np.concatenate([states[-1], u_at(corners[k - 1]), slope_at(corners[k - 1])])
        states.append((expm(M * dt) @ z)[:n])
    out = np.zeros((len(times), C.shape[0]))
    for i, t in enumerate(times):
        k = max(j for j in range(len(corners)) if corners[j] <= t + 1e-15 * times[-1])
        z = np.concatenate([states[k], u_at(corners[k]), slope_at(corners[k])])
        x = (expm(M * (t - corners[k])) @ z)[:n]
        out[i] = C @ x + D @ u_at(t)
    return out


def write(name, rdn, span, samples, labels, A, B, C, D, x0, inputs, times, u_lsim):
    y_expm = run_expm(A, B, C, D, x0, inputs, times)
    y_lsim = run_lsim(A, B, C, D, x0, u_lsim, times)
    signals = []
    for j, label in enumerate(labels):
        peak = float(np.max(np.abs(y_expm[:, j])))
        diff = float(np.max(np.abs(y_expm[:, j] - y_lsim[:, j]))) / peak
        print(f'{name} {label}: lsim vs expm {diff:.2e} (rel. to peak {peak:.6g})')
        assert diff <= 1e-12, 'lsim and expm disagree'
        signals.append({'label': label, 'peak': peak, 'values': [float(v) for v in y_lsim[:, j]]})
    with open(os.path.join(HERE, f'{name}.json'), 'w') as f:
        json.dump({'name': name, 'rdn': rdn, 'span': span, 'samples': samples,
                   'times': [float(t) for t in times], 'signals': signals}, f)


# --- table-rc-ladder --------------------------------------------------------------------------
# Nodes n1, n2, n3 with capacitors to ground; x = [v1, v2, v3], u = vin.
# KCL: C1 v1' = (vin - v1)/R1 - (v1 - v2)/R2 ; C2 v2' = (v1 - v2)/R2 - (v2 - v3)/R3 ;
#      C3 v3' = (v2 - v3)/R3.  Outputs v1, v3 and i(R1) = (vin - v1)/R1.
R1, R2, R3 = 1e3, 2.2e3, 4.7e3
C1, C2, C3 = 1e-6, 470e-9, 220e-9
A = np.array([[-1 / (R1 * C1) - 1 / (R2 * C1), 1 / (R2 * C1), 0],
              [1 / (R2 * C2), -1 / (R2 * C2) - 1 / (R3 * C2), 1 / (R3 * C2)],
              [0, 1 / (R3 * C3), -1 / (R3 * C3)]])
B = np.array([[1 / (R1 * C1)], [0], [0]])
C = np.array([[1, 0, 0], [0, 0, 1], [-1 / R1, 0, 0]])
D = np.array([[0], [0], [1 / R1]])
table = [(0, 0), (1e-3, 5), (3e-3, 5), (4e-3, -2), (6e-3, 1)]
span, samples = 10e-3, 1001
t = grid(span, samples)
# settled start: the table's value before t = 0 is 0 V, so every state starts at 0
write('table-rc-ladder', 'circuits/reference/table-rc-ladder.rdn', span, samples,
      ['v(n1)', 'v(n3)', 'i(R1)'], A, B, C, D, [0, 0, 0], [table], t,
      np.array([pwl(table, x) for x in t]))

# --- table-scope-current ----------------------------------------------------------------------
# x = [iS (Ls, p -> rail), vB (Cb), vC (Cc)]; u = [Vreg, Iload]. Rail node KCL:
#   iS = (v - vB)/Rb + (v - vC)/Rc + Iload  =>  v = (iS - Iload + vB/Rb + vC/Rc)/(1/Rb + 1/Rc)
# Ls iS' = Vreg - Rs iS - v ; Cb vB' = (v - vB)/Rb ; Cc vC' = (v - vC)/Rc.
Rs, Ls, Rb, Cb, Rc, Cc, Vreg = 10e-3, 20e-9, 20e-3, 220e-6, 20e-3, 22e-6, 1.8
G = 1 / Rb + 1 / Rc
vrow = np.array([1 / G, 1 / (Rb * G), 1 / (Rc * G)])  # v = vrow·x + vI·Iload
vI = -1 / G
A = np.zeros((3, 3))
B = np.zeros((3, 2))
A[0] = -vrow / Ls
A[0, 0] -= Rs / Ls
B[0] = [1 / Ls, -vI / Ls]
A[1] = vrow / (Rb * Cb)
A[1, 1] -= 1 / (Rb * Cb)
B[1] = [0, vI / (Rb * Cb)]
A[2] = vrow / (Rc * Cc)
A[2, 2] -= 1 / (Rc * Cc)
B[2] = [0, vI / (Rc * Cc)]
C = np.array([vrow, [1, 0, 0], [0, 0, 0]])
D = np.array([[0, vI], [0, 0], [0, 1]])
with open(os.path.join(ROOT, 'circuits', 'scope-current.csv')) as f:
    rows = [r for r in csv.reader(f)][1:]
scope = [(float(a), float(b)) for a, b in rows]
span, samples = 25e-6, 2501
t = grid(span, samples)
# settled start: DC operating point with Iload = first table value (caps charged to the rail)
I0 = scope[0][1]
x0 = np.linalg.solve(A, -B @ np.array([Vreg, I0]))
write('table-scope-current', 'circuits/scope-current.rdn', span, samples,
      ['rail voltage', 'plane current', 'load current'], A, B, C, D, x0,
      [[(0, Vreg), (span, Vreg)], scope], t,
      np.array([[Vreg, pwl(scope, x)] for x in t]))
