#!/usr/bin/env python3
"""Reference timings for bench/run.js (scipy / numpy, LAPACK underneath).

  python3 bench/reference.py lsim <model.json> <runs>
      simulates the state-space model ringdown exported (x' = Ax + Bu, y = Cx + Du, x(0) = 0,
      u = 1 V for t > 0) with scipy.signal.lsim on the same time grid; prints the median time and
      the largest difference from ringdown's samples, relative to each signal's peak magnitude.
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
        print(json.dumps({'referenceSeconds': statistics.median(times), 'maxRelError': err, **note}))
    elif mode == 'eig':
        A = np.array(d['A'], dtype=float)
        times = []
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


main()
