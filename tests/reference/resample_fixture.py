#!/usr/bin/env python3
"""Reference for packages/dsp resamplePoly: scipy.signal.resample_poly with its defaults.

Usage: python3 tests/reference/resample_fixture.py [output-dir]   (default: tests/fixtures/dsp)

Deterministic (numpy.random.default_rng with a fixed seed; the inputs are stored in the fixture),
so the TypeScript test never needs python.
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy import signal


def arr(x):
    return [float(v) for v in np.asarray(x, dtype=float).ravel()]


def main():
    out_dir = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(__file__), "..", "fixtures", "dsp")
    rng = np.random.default_rng(20261203)
    cases = []
    # (up, down): downsampling 48 kHz -> 2048 Hz reduces to 16/375; 3/2, 2/3 and 1/4 are small ratios.
    for up, down, n in [(16, 375, 3000), (3, 2, 257), (2, 3, 300), (1, 4, 101), (5, 1, 40)]:
        x = rng.standard_normal(n)
        y = signal.resample_poly(x, up, down)
        cases.append({"up": up, "down": down, "x": arr(x), "y": arr(y)})
    h = signal.firwin(2 * 10 * 3 + 1, 1.0 / 3, window=("kaiser", 5.0)) * 2
    payload = {"source": "scipy.signal.resample_poly, firwin", "versions": {"numpy": np.__version__, "scipy": scipy.__version__}, "cases": cases, "filter_up2_down3": arr(h)}
    with open(os.path.join(out_dir, "resample.json"), "w", encoding="utf-8") as fh:
        json.dump(payload, fh, separators=(",", ":"))
        fh.write("\n")


if __name__ == "__main__":
    main()
