"""Workload W1 in numpy, for comparison with bench/w1.ts (same sizes, same synthetic formula).

Per DOF: windows applied (force window x exponential window on the force, exponential window on the
responses), numpy.fft.rfft along the records, averaged G_ff, G_xx, G_fx (force conjugated), then
H1, H2 and coherence, single-sided ESD scaling. Data generation is not timed. Prints one JSON line.
"""
import json
import sys
import time

import numpy as np

DOFS, HITS, RESP, N, FS, REPEATS = (int(v) for v in sys.argv[1:7])
t = np.arange(N) / FS


def hash_noise(i, seed):
    v = np.sin(i * 12.9898 + seed * 78.233) * 43758.5453
    return 2 * (v - np.floor(v)) - 1


def make_dof(d):
    idx = np.arange(N, dtype=float)
    force = np.empty((HITS, N))
    resp = np.empty((HITS, RESP, N))
    for h in range(HITS):
        seed = d * 16 + h * 4
        amp = 80 + 10 * h + (d % 7)
        tt = t - 0.01
        force[h] = np.where((tt >= 0) & (tt <= 0.0008), amp * np.sin(np.pi * tt / 0.0008), 0.0) + 0.05 * hash_noise(idx, seed)
        for r in range(RESP):
            v = np.zeros(N)
            pos = tt > 0
            for m in range(3):
                f = 40 + 35 * m * (1 + 0.1 * r) + (d % 5)
                v[pos] += np.exp(-0.01 * 2 * np.pi * f * tt[pos]) * np.sin(2 * np.pi * f * tt[pos]) * (1 + m + r)
            resp[h, r] = amp * 0.01 * v + 0.002 * hash_noise(idx, seed + r + 1)
    return force, resp


# force window: unity to 20 ms, 5 ms half-cosine taper; exponential window from 10 ms, tau 0.3 s
i = np.arange(N)
ie = 0.02 * FS
tap = 0.005 * FS
fw = np.where(i <= ie + 1e-9, 1.0, np.where(i < ie + tap, 0.5 * (1 + np.cos(np.pi * (i - ie) / tap)), 0.0))
ew = np.where(t < 0.01, 1.0, np.exp(-(t - 0.01) / 0.3))
wf = fw * ew
dt = 1.0 / FS


def average_frf(force, resp):
    F = np.fft.rfft(force * wf, axis=-1)
    X = np.fft.rfft(resp * ew, axis=-1)
    scale = np.full(F.shape[-1], 2.0 * dt * dt / force.shape[0])
    scale[0] /= 2
    if N % 2 == 0:
        scale[-1] /= 2
    gff = (F.real ** 2 + F.imag ** 2).sum(axis=0) * scale
    gxx = (X.real ** 2 + X.imag ** 2).sum(axis=0) * scale
    gfx = (np.conj(F)[:, None, :] * X).sum(axis=0) * scale
    h1 = gfx / gff
    h2 = gxx / np.conj(gfx)
    coh = (gfx.real ** 2 + gfx.imag ** 2) / (gff * gxx)
    return h1, h2, coh, gff, gxx, gfx


data = [make_dof(d) for d in range(DOFS)]
check = float(np.mean(np.abs(average_frf(*data[0])[0][0][1:])))
for d in data[:5]:
    average_frf(*d)
times = []
for _ in range(REPEATS):
    t0 = time.perf_counter()
    for d in data:
        average_frf(*d)
    times.append(time.perf_counter() - t0)
print(json.dumps({"best": min(times), "times": times, "check": check, "numpy": np.__version__}))
