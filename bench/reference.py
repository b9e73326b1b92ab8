#!/usr/bin/env python3
"""Reference timings for bench/run.js (scipy / numpy, LAPACK underneath).

  python3 bench/reference.py lsim <model.json> <runs>
      simulates the state-space model ringdown exported (x' = Ax + Bu, y = Cx + Du, x(0) = 0,
      u = 1 V for t > 0) with scipy.signal.lsim on the same time grid; prints the median time and
      the largest difference from ringdown's samples, relative to each signal's peak magnitude;
      also times numpy.linalg.eig (values and vectors) on the same state matrix (eigSeconds).
  python3 bench/reference.py pwm <model.json> <runs>
      the PWM case: the model ringdown exported, driven by the pulse train it describes (x(0) = 0).
      Speed reference: scipy.signal.lsim with the input sampled on ringdown's sample grid. lsim
      interpolates linearly between those samples, so with a few samples per period its input is
      not the pulse train and its answer is not exact; the difference is printed (lsimMaxRelDiff)
      but it measures lsim's input, not ringdown's accuracy.
      Accuracy references (not timed against ringdown):
        - period map (whole span): the periodic state xs (fixed point of one period), the state at
          every period start as xs + expm(A·kT)·(0 − xs), then exact steps (scipy.linalg.expm of
          the model augmented with the input and its slope; the input is linear between corners)
          to each sample time; printed as fineMaxRelDiff;
        - lsim on a uniform grid through every pulse corner for the first 1 ms (there linear
          interpolation is the input itself), each sample time then reached by one exact step
          from the grid point before it; printed as fine1msMaxRelDiff.
  python3 bench/reference.py eig <matrix.json> <runs>
      times numpy.linalg.eig on the same matrix; prints the median time and the largest distance
      between matched eigenvalues, relative to the spectral radius.
Output: one JSON object on the last line.
"""
import json
import os
import statistics
import sys
import time

import numpy as np


def main():
    mode, path, runs = sys.argv[1], sys.argv[2], int(sys.argv[3])
    with open(path) as f:
        d = json.load(f)
    note = {'OPENBLAS_CORETYPE': os.environ.get('OPENBLAS_CORETYPE')} if os.environ.get('OPENBLAS_CORETYPE') else {}
    if mode == 'lsim':
        from scipy.signal import lsim
        A = np.array(d['A'], dtype=float)
        B = np.array(d['B'], dtype=float)
        C = np.array(d['C'], dtype=float)
        D = np.array(d['D'], dtype=float)
        t = np.array(d['times'])
        U = np.ones((len(t), B.shape[1]))
        times = []
        y = None
        for _ in range(runs):
            t0 = time.perf_counter()
            _, y, _ = lsim((A, B, C, D), U, t, X0=np.zeros(A.shape[0]))
            times.append(time.perf_counter() - t0)
        y = np.asarray(y).reshape(len(t), -1)
        ours = np.array(d['ours']).T
        peak = np.max(np.abs(y), axis=0)
        err = float(np.max(np.max(np.abs(ours - y), axis=0) / peak))
        eig_times = []
        np.linalg.eig(A)  # untimed first call, as ours gets warm-up calls
        for _ in range(max(runs, 3)):
            t0 = time.perf_counter()
            np.linalg.eig(A)
            eig_times.append(time.perf_counter() - t0)
        print(json.dumps({'referenceSeconds': statistics.median(times), 'maxRelError': err, 'eigSeconds': statistics.median(eig_times), **note}))
    elif mode == 'pwm':
        pwm(d, runs, note)
    elif mode == 'eig':
        A = np.array(d['A'], dtype=float)
        times = []
        np.linalg.eig(A)  # untimed first call, as ours gets warm-up calls
        for _ in range(runs):
            t0 = time.perf_counter()
            w, _ = np.linalg.eig(A)
            times.append(time.perf_counter() - t0)
        ours = np.array(d['re']) + 1j * np.array(d['im'])
        # greedy nearest matching
        left = list(w)
        worst = 0.0
        for z in ours:
            k = int(np.argmin(np.abs(np.array(left) - z)))
            worst = max(worst, abs(left[k] - z))
            left.pop(k)
        print(json.dumps({'referenceSeconds': statistics.median(times), 'maxRelError': worst / float(np.max(np.abs(w))), **note}))


def pulse_value(p, t):
    """The pulse train at times t (numpy array), written from its definition."""
    t = np.asarray(t, dtype=float)
    x = t - p['start']
    k = np.floor(x / p['period'])
    ph = x - k * p['period']
    inside = x >= 0
    if p['cycles'] is not None:
        inside &= k < p['cycles']
    d = p['high'] - p['low']
    r, w, f = p['rise'], p['width'], p['fall']
    v = np.full(t.shape, p['low'], dtype=float)
    up = inside & (ph < r)
    hi = inside & (ph >= r) & (ph < r + w)
    dn = inside & (ph >= r + w) & (ph < r + w + f)
    if r > 0:
        v[up] = p['low'] + d * ph[up] / r
    v[hi] = p['high']
    if f > 0:
        v[dn] = p['high'] - d * (ph[dn] - r - w) / f
    return v


def pulse_corners(p, span):
    n = int(np.ceil((span - p['start']) / p['period'])) + 1
    if p['cycles'] is not None:
        n = min(n, int(p['cycles']))
    c = p['start'] + np.arange(n) * p['period']
    r, w, f = p['rise'], p['width'], p['fall']
    out = np.concatenate([c, c + r, c + r + w, c + r + w + f])
    if p['cycles'] is not None:
        out = np.append(out, p['start'] + p['cycles'] * p['period'])
    return out[(out >= 0) & (out <= span)]


def foh_step(A, B, h, cache):
    """Φ, Γ0, Γ1 with x(h) = Φx(0) + Γ0·u(0) + Γ1·u'  for an input linear over [0, h]."""
    key = float(h)
    if key in cache:
        return cache[key]
    from scipy.linalg import expm
    n, m = B.shape
    M = np.zeros((n + 2 * m, n + 2 * m))
    M[:n, :n] = A
    M[:n, n:n + m] = B
    M[n:n + m, n + m:] = np.eye(m)
    E = expm(M * h)
    r = (E[:n, :n], E[:n, n:n + m], E[:n, n + m:])
    if len(cache) < 100000:
        cache[key] = r
    return r


def period_map_reference(A, B, C, D, pulses, t_out):
    """y at the times t_out, exact to round-off for every t.

    All pulses share one period T and start at 0, so the state at the start of period k is
    x(kT) = xs + e^(A·kT)·(x(0) − xs) with x(0) = 0 and xs the periodic state (the fixed point of one
    period, x(T) = Φ_T·x(0) + f). Within the period the input is linear between corners, and each
    sample is reached from kT by at most a few exact steps of the model augmented with the input
    and its slope. Nothing accumulates over the periods (stepping from corner to corner through
    10 000 periods would add up ~1e-10 of round-off).
    """
    from scipy.linalg import expm
    n, m = B.shape
    T = pulses[0]['period']
    if any(p['period'] != T or p['start'] != 0 or p['cycles'] is not None for p in pulses):
        return None
    cs = sorted({0.0, *(c for p in pulses for c in (p['rise'], p['rise'] + p['width'], p['rise'] + p['width'] + p['fall'])), T})
    cache = {}

    def u(ts):
        return np.array([pulse_value(p, np.asarray([ts]))[0] for p in pulses])

    def prop(x, a, b):
        # phases a < b within one period; the pulse is continuous (finite edges), so u(T) = u(0)
        h = b - a
        if h <= 0:
            return x
        Phi, G0, G1 = foh_step(A, B, h, cache)
        u0, u1 = u(a), u(b)
        return Phi @ x + G0 @ u0 + G1 @ ((u1 - u0) / h)

    def within(x, ph):
        prev = 0.0
        for c in cs[1:]:
            if c < ph:
                x, prev = prop(x, prev, c), c
            else:
                break
        return prop(x, prev, ph)

    if any(p['rise'] == 0 or p['fall'] == 0 for p in pulses):
        return None
    f = within(np.zeros(n), T)
    PhiT = expm(A * T)
    xs = np.linalg.solve(np.eye(n) - PhiT, f)
    ys = []
    starts = {}
    for ti in t_out:
        k = np.floor(ti / T)
        ph = ti - k * T
        if k not in starts:
            starts[k] = xs - expm(A * (k * T)) @ xs
        x = within(starts[k], ph)
        ys.append(C @ x + D @ u(ph))
    return np.array(ys)


def pwm(d, runs, note):
    from scipy.signal import lsim
    A = np.array(d['A'], dtype=float)
    B = np.array(d['B'], dtype=float)
    C = np.array(d['C'], dtype=float)
    D = np.array(d['D'], dtype=float)
    pulses = d['pulses']
    t = np.array(d['times'])
    ours = np.array(d['ours']).T
    n = A.shape[0]
    # speed reference: lsim on ringdown's grid, input sampled there
    U = np.array([pulse_value(p, t) for p in pulses]).T
    times = []
    y = None
    for _ in range(runs):
        t0 = time.perf_counter()
        _, y, _ = lsim((A, B, C, D), U, t, X0=np.zeros(n))
        times.append(time.perf_counter() - t0)
    y = np.asarray(y).reshape(len(t), -1)
    # accuracy reference 1: period map + exact steps within the period, whole span
    t0 = time.perf_counter()
    yf = period_map_reference(A, B, C, D, pulses, t)
    if yf is None:
        raise SystemExit('bench pwm: the pulses must share one period, start at 0, never end and have finite edges')
    fine_seconds = time.perf_counter() - t0
    peak = np.max(np.abs(yf), axis=0)
    lsim_diff = float(np.max(np.max(np.abs(y - yf), axis=0) / peak))
    ours_lsim = float(np.max(np.max(np.abs(ours - y), axis=0) / peak))
    ours_fine = float(np.max(np.max(np.abs(ours - yf), axis=0) / peak))
    # accuracy reference 2: lsim through every corner for the first 1 ms
    T1 = min(1e-3, float(t[-1]))
    # grid step: the largest common divisor of the corner offsets, found on a 1 ps lattice
    offs = [p[k] for p in pulses for k in ('period', 'rise', 'width', 'fall', 'start') if p[k] > 0]
    lat = [int(round(v / 1e-12)) for v in offs]
    g = 0
    for v in lat:
        g = int(np.gcd(g, v))
    dt = g * 1e-12
    fine1 = None
    if dt > 0 and T1 / dt <= 2_000_000 and all(abs(v / 1e-12 - round(v / 1e-12)) < 1e-3 for v in offs):
        N1 = int(round(T1 / dt))
        tg = np.arange(N1 + 1) * dt
        Ug = np.array([pulse_value(p, tg) for p in pulses]).T
        _, _, xg = lsim((A, B, C, D), Ug, tg, X0=np.zeros(n))
        xg = np.asarray(xg).reshape(len(tg), n)
        sel = np.nonzero(t <= tg[-1])[0]
        cache = {}
        worst = np.zeros(C.shape[0])
        for i in sel:
            j = min(int(np.floor(t[i] / dt + 1e-9)), N1)
            h = t[i] - tg[j]
            u0 = np.array([pulse_value(p, np.array([tg[j]]))[0] for p in pulses])
            u1 = np.array([pulse_value(p, np.array([t[i]]))[0] for p in pulses])
            x = xg[j]
            if h > 0:
                Phi, G0, G1 = foh_step(A, B, h, cache)
                x = Phi @ x + G0 @ u0 + G1 @ ((u1 - u0) / h)
            yi = C @ x + D @ u1
            worst = np.maximum(worst, np.abs(ours[i] - yi))
        fine1 = float(np.max(worst / peak))
    print(json.dumps({
        'referenceSeconds': statistics.median(times),
        'lsimMaxRelDiff': ours_lsim,
        'lsimVsExact': lsim_diff,
        'fineMaxRelDiff': ours_fine,
        'fineSeconds': fine_seconds,
        'fine1msMaxRelDiff': fine1,
        'fine1msStep': dt if fine1 is not None else None,
        'peak': peak.tolist(),
        **note,
    }))


main()
