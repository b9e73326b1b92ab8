#!/usr/bin/env python3
"""Build the golden reference data for test/reference/scipy-golden.test.ts.

Each circuit below is described twice, by hand and independently of ringdown's own code:
  * as a .rdn netlist (written to circuits/reference/), and
  * as a state-space model  x' = A x + B u,  y = C x  written straight from Kirchhoff's
    current law at every capacitor node and Kirchhoff's voltage law around every inductor loop.

The watched signals are simulated with scipy.signal.lsim (first-order hold, i.e. the input is
linear between grid points; each step propagates the state with the exact matrix exponential).
Our inputs are piecewise linear with every corner on a grid point, so lsim is exact up to
rounding. An ideal step at t0 > 0 cannot be represented by samples of u, so such runs are split
at t0 and lsim restarts there from the propagated state.

As an independent check the same samples are evaluated directly with scipy.linalg.expm of an
augmented matrix (state, input, input slope) from the start of each input segment, without any
time stepping; the script prints the largest lsim-versus-expm difference for every signal and
refuses to write a file when it exceeds 1e-12 relative to the signal's peak magnitude.

Run:  python3 test/golden/make_golden.py     (writes test/golden/*.json and circuits/reference/*.rdn)
The test suite only reads the JSON files; it never needs python.
"""
import json
import os

import numpy as np
from scipy.linalg import expm
from scipy.signal import lsim

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.normpath(os.path.join(HERE, '..', '..'))
GOLDEN_DIR = HERE
RDN_DIR = os.path.join(ROOT, 'circuits', 'reference')


# Segment starts are grid points up to rounding of i*span/(samples-1); a time within EPS of a
# segment start belongs to the new segment (the 1e-18 s offset changes no signal by 1e-15).
EPS = 1e-15


def grid(span, samples):
    return np.array([span * i / (samples - 1) for i in range(samples)])


# ---------------------------------------------------------------------------------------------
# Input description: a list of segments (t_start, u_start, slope); u is continuous or jumps
# exactly at a segment start. Every segment start must be a grid point.
# ---------------------------------------------------------------------------------------------

def simulate_lsim(A, B, C, x0, segments, times):
    """lsim over each input segment in turn, restarting from the propagated state."""
    n = A.shape[0]
    D = np.zeros((C.shape[0], 1))
    out = np.zeros((len(times), C.shape[0]))
    x = np.array(x0, dtype=float)
    bounds = [s[0] for s in segments] + [np.inf]
    for k, seg in enumerate(segments):
        idx = [i for i, t in enumerate(times) if bounds[k] - EPS <= t < bounds[k + 1] - EPS]
        if not idx:
            continue
        i0 = idx[0]
        assert abs(times[i0] - seg[0]) <= EPS, 'segment start must be a grid point'
        # include the next segment's first point so the state is carried over exactly
        last = idx[-1] + 1 if idx[-1] + 1 < len(times) else idx[-1]
        tt = times[i0:last + 1] - times[i0]
        uu = np.array([seg[1] + seg[2] * t for t in tt])
        if len(tt) == 1:
            out[i0] = C @ x
            continue
        _, y, xs = lsim((A, B.reshape(n, 1), C, D), uu, tt, X0=x, interp=True)
        y = np.asarray(y).reshape(len(tt), -1)
        out[i0:idx[-1] + 1] = y[:len(idx)]
        x = np.asarray(xs).reshape(len(tt), n)[-1]
    return out


def simulate_expm(A, B, C, x0, segments, times):
    """Direct evaluation: x(t) = [I 0 0] expm(M (t - ts)) [x(ts); u(ts); u'] on each segment."""
    n = A.shape[0]
    M = np.zeros((n + 2, n + 2))
    M[:n, :n] = A
    M[:n, n] = B
    M[n, n + 1] = 1.0
    out = np.zeros((len(times), C.shape[0]))
    x = np.array(x0, dtype=float)
    bounds = [s[0] for s in segments] + [np.inf]
    for k, seg in enumerate(segments):
        z0 = np.concatenate([x, [seg[1], seg[2]]])
        for i, t in enumerate(times):
            if bounds[k] - EPS <= t < bounds[k + 1] - EPS:
                out[i] = C @ (expm(M * (t - seg[0])) @ z0)[:n]
        if bounds[k + 1] < np.inf:
            x = (expm(M * (bounds[k + 1] - seg[0])) @ z0)[:n]
    return out


def build(name, title, rdn, A, B, C, x0, segments, span, samples, labels):
    times = grid(span, samples)
    y_lsim = simulate_lsim(A, B, C, x0, segments, times)
    y_expm = simulate_expm(A, B, C, x0, segments, times)
    signals = []
    print(f'{name}: {A.shape[0]} states, {samples} samples over {span:g} s')
    for j, label in enumerate(labels):
        peak = np.max(np.abs(y_expm[:, j]))
        err = np.max(np.abs(y_lsim[:, j] - y_expm[:, j])) / peak
        print(f'  {label:12s} peak {peak:.6g}   max |lsim - expm| / peak = {err:.3e}')
        if err > 1e-12:
            raise SystemExit(f'{name}/{label}: lsim and expm disagree by {err:.3e} (limit 1e-12)')
        signals.append({'label': label, 'peak': float(peak), 'values': [float(v) for v in y_lsim[:, j]]})
    os.makedirs(RDN_DIR, exist_ok=True)
    rdn_path = os.path.join(RDN_DIR, name + '.rdn')
    with open(rdn_path, 'w') as f:
        f.write(rdn)
    doc = {
        'name': name,
        'title': title,
        'rdn': os.path.relpath(rdn_path, ROOT),
        'source': 'scipy.signal.lsim (first-order hold) on a hand-written Kirchhoff state-space model, '
                  'checked against scipy.linalg.expm',
        'span': span,
        'samples': samples,
        'times': [float(t) for t in times],
        'signals': signals,
    }
    with open(os.path.join(GOLDEN_DIR, name + '.json'), 'w') as f:
        json.dump(doc, f, indent=None)
        f.write('\n')


# ---------------------------------------------------------------------------------------------
# (a) 12-section RC ladder driven by a 5 V ideal step at t = 0.
#     in -R1- n1 -R2- n2 ... -R12- n12, each node n_k has C_k to ground.
#     KCL at n_k:  C dv_k/dt = (v_{k-1} - v_k)/R - (v_k - v_{k+1})/R,  v_0 = u,  no R13.
# ---------------------------------------------------------------------------------------------

def rc_ladder():
    N, R, Cap, V = 12, 1e3, 10e-9, 5.0
    A = np.zeros((N, N))
    B = np.zeros(N)
    for k in range(N):
        A[k, k] -= 1 / (R * Cap)
        if k == 0:
            B[k] += 1 / (R * Cap)
        else:
            A[k, k - 1] += 1 / (R * Cap)
        if k < N - 1:
            A[k, k] -= 1 / (R * Cap)
            A[k, k + 1] += 1 / (R * Cap)
    C = np.zeros((2, N))
    C[0, 0] = 1.0
    C[1, N - 1] = 1.0
    lines = [
        'title "Golden: 12-section RC ladder, 5 V step"',
        '# A 12-section distributed RC line (1k / 10nF per section) driven by an ideal 5 V step.',
        '# Reference data: test/golden/rc-ladder-12.json from test/golden/make_golden.py.',
        'voltage-source V1 in -> gnd step from 0V to 5V at 0',
    ]
    prev = 'in'
    for k in range(1, N + 1):
        lines.append(f'resistor R{k} {prev} -> n{k} 1k')
        lines.append(f'capacitor C{k} n{k} -> gnd 10nF')
        prev = f'n{k}'
    lines += ['watch node n1 as "v(n1)"', f'watch node n{N} as "v(n{N})"', 'span 3ms', 'samples 601', '']
    build('rc-ladder-12', '12-section RC ladder', '\n'.join(lines), A, B, C, np.zeros(N),
          [(0.0, V, 0.0)], 3e-3, 601, ['v(n1)', f'v(n{N})'])


# ---------------------------------------------------------------------------------------------
# (b) Lossy LC ladder, 6 sections: series R + L, shunt C, load resistor; 10 V step, 2 us rise.
#     states: i_k through R_k, L_k (from n_{k-1} to n_k; n_0 = in), v_k on C_k.
#     KVL:  L di_k/dt = v_{k-1} - R i_k - v_k        (v_0 = u)
#     KCL:  C dv_k/dt = i_k - i_{k+1},   i_7 = v_6 / Rload
# ---------------------------------------------------------------------------------------------

def lc_ladder():
    N, R, L, Cap, Rload = 6, 0.5, 1e-6, 1e-6, 5.0
    V, rise = 10.0, 2e-6
    n = 2 * N
    A = np.zeros((n, n))
    B = np.zeros(n)
    I = lambda k: 2 * k      # index of i_{k+1}
    Vn = lambda k: 2 * k + 1  # index of v_{k+1}
    for k in range(N):
        A[I(k), I(k)] = -R / L
        A[I(k), Vn(k)] = -1 / L
        if k == 0:
            B[I(k)] = 1 / L
        else:
            A[I(k), Vn(k - 1)] = 1 / L
        A[Vn(k), I(k)] = 1 / Cap
        if k < N - 1:
            A[Vn(k), I(k + 1)] = -1 / Cap
        else:
            A[Vn(k), Vn(k)] = -1 / (Rload * Cap)
    C = np.zeros((2, n))
    C[0, Vn(N - 1)] = 1.0
    C[1, I(0)] = 1.0
    lines = [
        'title "Golden: lossy 6-section LC ladder, 10 V step with 2 us rise"',
        '# Six sections of 0.5 ohm + 1 uH series, 1 uF shunt, 5 ohm load.',
        '# Reference data: test/golden/lc-ladder-6.json from test/golden/make_golden.py.',
        'voltage-source V1 in -> gnd step from 0V to 10V at 0 rise 2us',
    ]
    prev = 'in'
    for k in range(1, N + 1):
        lines.append(f'resistor R{k} {prev} -> a{k} 0.5ohm')
        lines.append(f'inductor L{k} a{k} -> n{k} 1uH')
        lines.append(f'capacitor C{k} n{k} -> gnd 1uF')
        prev = f'n{k}'
    lines += ['resistor Rload n6 -> gnd 5ohm',
              'watch node n6 as "v(load)"', 'watch current L1 as "i(L1)"', 'span 60us', 'samples 601', '']
    build('lc-ladder-6', 'lossy 6-section LC ladder', '\n'.join(lines), A, B, C, np.zeros(n),
          [(0.0, 0.0, V / rise), (rise, V, 0.0)], 60e-6, 601, ['v(load)', 'i(L1)'])


# ---------------------------------------------------------------------------------------------
# (c) Two-loop RLC network with stored energy at t = 0 and a 10 V step at 200 us.
#     in -R1- a -L1- m, C1 m->gnd; m -R2- b -L2- out, C2 out->gnd, Rl out->gnd.
#     states x = [i1 (L1, a->m), v1 (C1), i2 (L2, b->out), v2 (C2)]
#     L1 di1/dt = u - R1 i1 - v1
#     C1 dv1/dt = i1 - i2
#     L2 di2/dt = v1 - R2 i2 - v2
#     C2 dv2/dt = i2 - v2 / Rl
#     initial: i1 = 0.5 A, v1 = 3 V, i2 = -0.2 A, v2 = 0
# ---------------------------------------------------------------------------------------------

def two_loop():
    R1, L1, C1, R2, L2, C2, Rl = 2.0, 100e-6, 22e-6, 1.0, 47e-6, 10e-6, 8.0
    A = np.array([
        [-R1 / L1, -1 / L1, 0, 0],
        [1 / C1, 0, -1 / C1, 0],
        [0, 1 / L2, -R2 / L2, -1 / L2],
        [0, 0, 1 / C2, -1 / (Rl * C2)],
    ])
    B = np.array([1 / L1, 0, 0, 0])
    C = np.array([
        [0, 1.0, 0, 0],   # v(m)
        [0, 0, 0, 1.0],   # v(out)
        [1.0, 0, 0, 0],   # i(L1)
        [0, 0, 1.0, 0],   # i(L2)
    ])
    x0 = np.array([0.5, 3.0, -0.2, 0.0])
    rdn = '\n'.join([
        'title "Golden: two-loop RLC with stored energy and a delayed 10 V step"',
        '# Two coupled RLC loops; C1 starts at 3 V, L1 at 0.5 A, L2 at -0.2 A; the source',
        '# steps from 0 V to 10 V at 200 us.',
        '# Reference data: test/golden/two-loop-rlc.json from test/golden/make_golden.py.',
        'voltage-source V1 in -> gnd step from 0V to 10V at 200us',
        'resistor R1 in -> a 2ohm',
        'inductor L1 a -> m 100uH initial 0.5A',
        'capacitor C1 m -> gnd 22uF initial 3V',
        'resistor R2 m -> b 1ohm',
        'inductor L2 b -> out 47uH initial -0.2A',
        'capacitor C2 out -> gnd 10uF',
        'resistor Rl out -> gnd 8ohm',
        'watch node m as "v(m)"',
        'watch node out as "v(out)"',
        'watch current L1 as "i(L1)"',
        'watch current L2 as "i(L2)"',
        'span 1ms',
        'samples 1001',
        '',
    ])
    build('two-loop-rlc', 'two-loop RLC with initial state', rdn, A, B, C, x0,
          [(0.0, 0.0, 0.0), (200e-6, 10.0, 0.0)], 1e-3, 1001, ['v(m)', 'v(out)', 'i(L1)', 'i(L2)'])


if __name__ == '__main__':
    rc_ladder()
    lc_ladder()
    two_loop()
