#!/usr/bin/env python3
"""Reference fixtures for packages/dsp, computed with numpy and scipy (outside the project).

Usage: python3 tests/reference/dsp_fixtures.py [output-dir]   (default: tests/fixtures/dsp)

Deterministic: the pseudo-random data come from numpy.random.default_rng with fixed seeds and are
stored in the fixtures, so the TypeScript tests never need python. The suite re-runs this script
into a temporary folder when scipy is installed and checks the output equals the committed files.
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy import integrate, signal


def arr(x):
    return [float(v) for v in np.asarray(x, dtype=float).ravel()]


def write(out_dir, name, payload):
    path = os.path.join(out_dir, name)
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(payload, fh, separators=(",", ":"))
        fh.write("\n")


def versions():
    return {"numpy": np.__version__, "scipy": scipy.__version__}


def transient_fixture(out_dir):
    """numpy.fft.rfft(x) * dt for odd, even and non-power-of-two lengths."""
    rng = np.random.default_rng(20240601)
    fs = 1000.0
    cases = []
    for n in [1, 2, 3, 4, 5, 6, 7, 8, 12, 37, 64, 100, 255, 1000, 1024]:
        x = rng.standard_normal(n)
        X = np.fft.rfft(x) / fs
        cases.append({"n": n, "x": arr(x), "re": arr(X.real), "im": arr(X.imag)})
    # Half-sine of docs/methods.md#pulse-spectra: A = 100 N, T = 1 ms, fs = 51.2 kHz, N = 8192.
    fs_h, n_h, a_h, t_h = 51200.0, 8192, 100.0, 1e-3
    t = np.arange(n_h) / fs_h
    half = np.where(t <= t_h, a_h * np.sin(np.pi * t / t_h), 0.0)
    H = np.fft.rfft(half) / fs_h
    k500 = int(round(500 / (fs_h / n_h)))
    write(out_dir, "transient.json", {
        "source": "numpy.fft.rfft(x)/fs (sign e^{-j2pi kn/N}); x from default_rng(20240601).standard_normal(n)",
        "versions": versions(),
        "fs": fs,
        "cases": cases,
        "halfSine": {
            "fs": fs_h, "n": n_h, "amplitude": a_h, "durationS": t_h,
            "x0": float(H[0].real), "abs500": float(abs(H[k500])), "abs1000": float(abs(H[2 * k500])),
        },
    })


def welch_fixture(out_dir):
    """scipy.signal.welch / csd / coherence with detrend=False on stored pseudo-random data."""
    rng = np.random.default_rng(7)
    fs = 1000.0
    n = 2048
    x = rng.standard_normal(n)
    # y: x through a short FIR filter plus independent noise, so the coherence is between 0 and 1.
    b = np.array([0.5, 0.3, -0.2, 0.1])
    y = signal.lfilter(b, [1.0], x) + 0.3 * rng.standard_normal(n)
    settings = [
        {"window": "hann", "scipyWindow": "hann", "segmentLength": 256, "overlapSamples": 128},
        {"window": "rectangular", "scipyWindow": "boxcar", "segmentLength": 200, "overlapSamples": 50},
        {"window": "flattop", "scipyWindow": "flattop", "segmentLength": 255, "overlapSamples": 100},
        {"window": "hann", "scipyWindow": "hann", "segmentLength": 2048, "overlapSamples": 0},
    ]
    results = []
    for s in settings:
        kw = dict(fs=fs, window=s["scipyWindow"], nperseg=s["segmentLength"], noverlap=s["overlapSamples"], detrend=False)
        f, pxx = signal.welch(x, **kw)
        _, pxy = signal.csd(x, y, **kw)
        _, cxy = signal.coherence(x, y, **kw)
        results.append({**s, "f": arr(f), "psd": arr(pxx), "csdRe": arr(pxy.real), "csdIm": arr(pxy.imag), "coherence": arr(cxy)})
    windows = []
    for name, scipy_name in [("hann", "hann"), ("rectangular", "boxcar"), ("flattop", "flattop")]:
        for m in [1, 2, 16, 17]:
            windows.append({"window": name, "n": m, "values": arr(signal.get_window(scipy_name, m, fftbins=True))})
    write(out_dir, "welch.json", {
        "source": "scipy.signal.welch/csd/coherence(detrend=False, scaling='density', average='mean'); scipy.signal.get_window(fftbins=True)",
        "versions": versions(),
        "fs": fs, "x": arr(x), "y": arr(y), "results": results, "windows": windows,
    })


def sdof_fixture(out_dir):
    """SDOF (m = 1 kg, fn = 100 Hz, zeta = 2 %) struck by a 100 N, 5 ms half-sine.

    Acceleration from scipy.integrate.solve_ivp (DOP853, rtol 1e-12) of m x'' + c x' + k x = f(t),
    integrated in two pieces (during and after the pulse) so the kink at t = T is resolved; the
    closed-form accelerance A = -w^2 / (k - m w^2 + j c w) is docs/methods.md#frf-kinds.
    """
    m, fn, zeta = 1.0, 100.0, 0.02
    wn = 2 * np.pi * fn
    k = m * wn ** 2
    c = 2 * zeta * np.sqrt(k * m)
    amp, tc = 100.0, 5e-3
    fs, n = 4096.0, 4096
    t = np.arange(n) / fs

    def force(tt):
        return amp * np.sin(np.pi * tt / tc) if tt <= tc else 0.0

    def rhs(tt, s):
        return [s[1], (force(tt) - c * s[1] - k * s[0]) / m]

    opts = dict(method="DOP853", rtol=1e-12, atol=1e-16)
    in_pulse = t[t <= tc]
    after = t[t > tc]
    s1 = integrate.solve_ivp(rhs, (0.0, tc), [0.0, 0.0], t_eval=np.append(in_pulse, tc) if in_pulse[-1] < tc else in_pulse, **opts)
    state_end = s1.y[:, -1]
    s2 = integrate.solve_ivp(rhs, (tc, t[-1]), state_end, t_eval=after, **opts)
    disp = np.concatenate([s1.y[0][: len(in_pulse)], s2.y[0]])
    vel = np.concatenate([s1.y[1][: len(in_pulse)], s2.y[1]])
    f_samples = np.array([force(tt) for tt in t])
    acc = (f_samples - c * vel - k * disp) / m
    lines = np.arange(60, 141)  # 60 ... 140 Hz at df = 1 Hz
    w = 2 * np.pi * lines
    accel = -w ** 2 / (k - m * w ** 2 + 1j * c * w)
    write(out_dir, "sdof-half-sine.json", {
        "source": "scipy.integrate.solve_ivp(DOP853, rtol=1e-12) of m x''+c x'+k x=f; accelerance -w^2/(k-m w^2+j c w)",
        "versions": versions(),
        "m": m, "fnHz": fn, "zeta": zeta, "k": k, "c": c,
        "amplitudeN": amp, "durationS": tc, "fs": fs, "n": n,
        "force": arr(f_samples), "acceleration": arr(acc),
        "linesHz": arr(lines), "accelRe": arr(accel.real), "accelIm": arr(accel.imag),
    })


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out_dir = sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "..", "fixtures", "dsp")
    os.makedirs(out_dir, exist_ok=True)
    transient_fixture(out_dir)
    welch_fixture(out_dir)
    sdof_fixture(out_dir)


if __name__ == "__main__":
    main()
