#!/usr/bin/env python3
"""Golden data for test/scenarios/*.test.ts: rail-load-step and pwm-lc-filter.

State-space models written here by hand from Kirchhoff's laws (independent of ringdown's code);
the inputs are piecewise linear, so the response is evaluated exactly (up to rounding) with
scipy.linalg.expm of the augmented matrix [[A, B, 0], [0, 0, I], [0, 0, 0]], propagated from
input corner to input corner (no time stepping).

pwm-lc-filter also gets its periodic steady state, computed independently of the transient:
the one-period map x -> Phi x + g (Phi = expm(A T), g = the response over one period from zero
state) has the fixed point x* = (I - Phi)^-1 g; the steady-state waveform over a period is
evaluated from x*.

Run: python3 test/golden/make_scenario_golden.py   (writes test/golden/scenario-*.json)
"""
import json
import os

import numpy as np
from scipy.linalg import expm

HERE = os.path.dirname(os.path.abspath(__file__))


def grid(span, samples):
    return np.array([span * i / (samples - 1) for i in range(samples)])


class Pwl:
    """Piecewise-linear input: corners (t, value) with value held outside."""

    def __init__(self, pts):
        self.t = np.array([p[0] for p in pts], dtype=float)
        self.v = np.array([p[1] for p in pts], dtype=float)

    def at(self, t):
        return float(np.interp(t, self.t, self.v))

    def slope(self, t):  # slope of the segment starting at t
        k = np.searchsorted(self.t, t, side='right')
        if k == 0 or k >= len(self.t):
            return 0.0
        return (self.v[k] - self.v[k - 1]) / (self.t[k] - self.t[k - 1])


def augmented(A, B):
    n, m = A.shape[0], B.shape[1]
    M = np.zeros((n + 2 * m, n + 2 * m))
    M[:n, :n] = A
    M[:n, n:n + m] = B
    M[n:n + m, n + m:] = np.eye(m)
    return M


def simulate(A, B, C, D, x0, inputs, times, t_start=0.0):
    n = A.shape[0]
    M = augmented(A, B)
    corners = sorted(set([t_start] + [float(c) for u in inputs for c in u.t if t_start < c < times[-1]]))
    u = lambda t: np.array([w.at(t) for w in inputs])
    s = lambda t: np.array([w.slope(t) for w in inputs])
    states = [np.array(x0, dtype=float)]
    for k in range(1, len(corners)):
        z = np.concatenate([states[-1], u(corners[k - 1]), s(corners[k - 1])])
        states.append((expm(M * (corners[k] - corners[k - 1])) @ z)[:n])
    out = np.zeros((len(times), C.shape[0]))
    x = None
    tol = 1e-12 * (times[-1] - t_start)
    for i, t in enumerate(times):
        k = max(j for j in range(len(corners)) if corners[j] <= t + tol)
        z = np.concatenate([states[k], u(corners[k]), s(corners[k])])
        x = (expm(M * (t - corners[k])) @ z)[:n]
        out[i] = C @ x + D @ u(t)
    return out, x  # x: the state at the last time


def dump(name, rdn, times, labels, values, extra=None):
    signals = []
    for j, label in enumerate(labels):
        peak = float(np.max(np.abs(values[:, j])))
        signals.append({'label': label, 'peak': peak, 'values': [float(v) for v in values[:, j]]})
    data = {'name': name, 'rdn': rdn, 'times': [float(t) for t in times], 'signals': signals}
    if extra:
        data.update(extra)
    with open(os.path.join(HERE, f'{name}.json'), 'w') as f:
        json.dump(data, f)
    print('wrote', name, [round(s['peak'], 6) for s in signals])


# --- rail-load-step ----------------------------------------------------------------------------
# x = [iP (Lpl), iB (Lb), vB (Cb), iC (Lc), vC (Cc), vD (Cd)]; u = [Vreg, Iload].
# Rail node KCL: iP = iB + iC + iD + Iload with iD = (v - vD)/Rd, so
#   v = vD + Rd (iP - iB - iC - Iload).
# Lpl iP' = Vreg - Rpl iP - v ; Lb iB' = v - Rb iB - vB ; Cb vB' = iB ;
# Lc iC' = v - Rc iC - vC ; Cc vC' = iC ; Cd vD' = iP - iB - iC - Iload.
Rpl, Lp, Rb, Lb, Cb, Rc, Lc, Cc, Rd, Cd = 5e-3, 30e-9, 30e-3, 5e-9, 470e-6, 10e-3, 0.5e-9, 22e-6, 20e-3, 100e-9
vx = np.array([Rd, -Rd, 0, -Rd, 0, 1.0])
vI = -Rd
A = np.zeros((6, 6))
B = np.zeros((6, 2))
A[0] = -vx / Lp
A[0, 0] -= Rpl / Lp
B[0] = [1 / Lp, -vI / Lp]
A[1] = vx / Lb
A[1, 1] -= Rb / Lb
A[1, 2] -= 1 / Lb
B[1] = [0, vI / Lb]
A[2, 1] = 1 / Cb
A[3] = vx / Lc
A[3, 3] -= Rc / Lc
A[3, 4] -= 1 / Lc
B[3] = [0, vI / Lc]
A[4, 3] = 1 / Cc
A[5] = [1 / Cd, -1 / Cd, 0, -1 / Cd, 0, 0]
B[5] = [0, -1 / Cd]
C = np.array([vx, [0, 1, 0, 0, 0, 0], [0, 0, 0, 1, 0, 0]])
D = np.array([[0, vI], [0, 0], [0, 0]])
span, samples = 100e-6, 2001
t = grid(span, samples)
Vreg, I0 = 3.3, 0.2
# settled start: DC operating point at Iload = 0.2 A (exact: caps at the rail voltage, no cap current)
x0 = np.array([I0, 0, Vreg - Rpl * I0, 0, Vreg - Rpl * I0, Vreg - Rpl * I0])
assert np.max(np.abs(A @ x0 + B @ [Vreg, I0])) < 1e-6
y, _ = simulate(A, B, C, D, x0, [Pwl([(0, Vreg), (span, Vreg)]), Pwl([(10e-6, 0.2), (11e-6, 3.0)])], t)
dump('scenario-rail-load-step', 'circuits/rail-load-step.rdn', t,
     ['rail voltage', 'bulk capacitor current', 'ceramic capacitor current'], y)

# --- pwm-lc-filter -----------------------------------------------------------------------------
# x = [iL (Lf), vC (Cf)]; u = switch-node voltage. Output node KCL:
#   iL = (v - vC)/Resr + v/Rload  =>  v = (iL + vC/Resr)/(1/Resr + 1/Rload)
# Lf iL' = u - RL iL - v ; Cf vC' = (v - vC)/Resr.
L, RL, Cf, Resr, Rload = 4.7e-6, 20e-3, 22e-6, 5e-3, 1.0
g = 1 / Resr + 1 / Rload
vrow = np.array([1 / g, 1 / (Resr * g)])
A = np.zeros((2, 2))
A[0] = -vrow / L
A[0, 0] -= RL / L
A[1] = vrow / (Resr * Cf)
A[1, 1] -= 1 / (Resr * Cf)
B = np.array([[1 / L], [0.0]])
C = np.array([vrow, [1.0, 0.0]])
D = np.zeros((2, 1))
T, Vin, rise, width, fall = 10e-6, 12.0, 20e-9, 4e-6, 20e-9
ncyc = 100
pts = []
for k in range(ncyc + 1):
    t0 = k * T
    pts += [(t0, 0.0), (t0 + rise, Vin), (t0 + rise + width, Vin), (t0 + rise + width + fall, 0.0)]
span, samples = 1e-3, 10001
t = grid(span, samples)
y, _ = simulate(A, B, C, D, [0, 0], [Pwl(pts)], t)
# periodic steady state: one period of the input from zero state gives g; Phi = expm(A T)
one = Pwl([(0, 0.0), (rise, Vin), (rise + width, Vin), (rise + width + fall, 0.0), (T, 0.0)])
_, gT = simulate(A, B, C, D, [0, 0], [one], np.array([0.0, T]))
Phi = expm(A * T)
xs = np.linalg.solve(np.eye(2) - Phi, gT)
tl = t[t >= (ncyc - 1) * T - 1e-12 * span]  # the last period of the span
ypss, xend = simulate(A, B, C, D, xs, [one], tl - (ncyc - 1) * T)
assert np.max(np.abs(xend - xs)) < 1e-9 * np.max(np.abs(xs))
dump('scenario-pwm-transient', 'circuits/pwm-lc-filter.rdn', t, ['output voltage', 'inductor current'], y)
dump('scenario-pwm-pss', 'circuits/pwm-lc-filter.rdn', tl, ['output voltage', 'inductor current'], ypss,
     {'pssState': [float(v) for v in xs]})
print('pwm last-cycle transient vs pss:', np.max(np.abs(y[-len(tl):] - ypss), axis=0))
