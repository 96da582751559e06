#!/usr/bin/env python3
"""Reference fixtures for packages/dsp/src/modal, computed with numpy and scipy (outside the project).

Usage: python3 tests/reference/modal_fixtures.py [output-dir]   (default: tests/fixtures/modal)

Every system here is also built in TypeScript by packages/dsp/src/modal/test-support.ts; these files let
the tests confirm those builders (and the CMIF) against numpy.linalg / scipy.linalg. Deterministic.
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy import linalg, optimize


def arr(x):
    return [float(v) for v in np.asarray(x, dtype=float).ravel()]


def write(out_dir, name, payload):
    payload["versions"] = {"numpy": np.__version__, "scipy": scipy.__version__}
    with open(os.path.join(out_dir, name), "w", encoding="utf-8") as fh:
        json.dump(payload, fh, separators=(",", ":"))
        fh.write("\n")


def frf_matrix(M, K, C, f):
    """Receptance matrices inv(K - w^2 M + j w C), shape (lines, n, n)."""
    out = []
    for fk in f:
        w = 2 * np.pi * fk
        out.append(np.linalg.inv(K - w * w * M + 1j * w * C))
    return np.array(out)


def state_poles(M, K, C):
    """Continuous-time poles of M x'' + C x' + K x = 0 (positive imaginary part), by scipy.linalg.eig."""
    n = M.shape[0]
    A = np.block([[np.zeros((n, n)), np.eye(n)], [-np.linalg.solve(M, K), -np.linalg.solve(M, C)]])
    lam = linalg.eigvals(A)
    lam = lam[lam.imag > 0]
    lam = lam[np.argsort(lam.imag)]
    wn = np.abs(lam)
    return lam, wn / (2 * np.pi), -lam.real / wn


def rayleigh(z1, w1, z2, w2):
    b = 2 * (z2 * w2 - z1 * w1) / (w2**2 - w1**2)
    return 2 * z1 * w1 - b * w1**2, b


def system_case(M, K, C, f):
    H = frf_matrix(M, K, C, f)
    lam, fn, zeta = state_poles(M, K, C)
    w2, phi = linalg.eigh(K, M)  # mass-normalised modes, ascending
    return {
        "f": arr(f),
        "re": [arr(H[k].real) for k in range(len(f))],  # row-major n x n per line
        "im": [arr(H[k].imag) for k in range(len(f))],
        "lambdaRe": arr(lam.real),
        "lambdaIm": arr(lam.imag),
        "fn": arr(fn),
        "zeta": arr(zeta),
        "undampedHz": arr(np.sqrt(w2) / (2 * np.pi)),
        "modes": [arr(phi[:, r]) for r in range(phi.shape[1])],
    }


def systems(out_dir):
    # docs/methods.md#chain-2dof-lscf: M = I, K = 400*[[2000,-1000],[-1000,2000]], zeta 1 % and 2 % (Rayleigh)
    M = np.eye(2)
    K = 400.0 * np.array([[2000.0, -1000.0], [-1000.0, 2000.0]])
    w = np.sqrt(linalg.eigvalsh(K, M))
    a, b = rayleigh(0.01, w[0], 0.02, w[1])
    two = system_case(M, K, a * M + b * K, np.array([50.0, 80.0, 100.0, 100.625, 130.0, 174.375, 200.0]))
    two["rayleigh"] = [a, b]
    # docs/methods.md#chain-3dof: 3-DOF fixed-fixed, m = 1 kg, k = 1000 N/m; modal damping 1 %, 1.5 %, 2 %
    M3 = np.eye(3)
    K3 = 1000.0 * np.array([[2.0, -1.0, 0.0], [-1.0, 2.0, -1.0], [0.0, -1.0, 2.0]])
    w2, phi = linalg.eigh(K3, M3)
    z3 = np.array([0.01, 0.015, 0.02])
    C3 = M3 @ phi @ np.diag(2 * z3 * np.sqrt(w2)) @ phi.T @ M3
    three = system_case(M3, K3, C3, np.array([1.0, 3.85, 5.0, 7.1, 8.0, 9.3, 12.0]))
    three["modalZeta"] = arr(z3)
    write(out_dir, "systems.json", {"twoDof63": two, "threeDof73d": three})


def close_modes_cmif(out_dir):
    """Singular values (numpy.linalg.svd) of the 6 x 2 FRF matrix of two modes 1 % apart, at a few lines."""
    psi = np.array([[1.0, 0.8, 0.3, -0.2, -0.7, -1.0], [0.9, -0.4, -1.0, -0.3, 0.5, 1.0]]).T
    fr = np.array([100.0, 101.0])
    zeta = 0.005
    refs = [0, 4]
    f = np.array([98.0, 99.5, 100.0, 100.5, 101.0, 102.5])
    sv = []
    for fk in f:
        w = 2 * np.pi * fk
        H = np.zeros((6, 2), dtype=complex)
        for r in range(2):
            wr = 2 * np.pi * fr[r]
            H += np.outer(psi[:, r], psi[refs, r]) / (wr**2 - w**2 + 2j * zeta * wr * w)
        sv.append(arr(np.linalg.svd(H, compute_uv=False)))
    write(out_dir, "close-modes-cmif.json", {"psi": [arr(psi[:, r]) for r in range(2)], "fHz": arr(fr), "zeta": zeta,
                                             "references": refs, "f": arr(f), "singularValues": sv})


def free_free_bar(out_dir):
    """Roots of cos(bL)cosh(bL) = 1 by brentq and the mass-normalised shapes at x = 0..1 m step 50 mm."""
    L, b, h, E, rho = 1.0, 0.040, 0.010, 210e9, 7850.0
    A = b * h
    I = b * h**3 / 12
    g = lambda x: np.cos(x) * np.cosh(x) - 1
    roots = [optimize.brentq(g, (n + 0.5) * np.pi - 0.5, (n + 0.5) * np.pi + 0.5, xtol=1e-14) for n in range(1, 7)]
    fn = [r**2 / (2 * np.pi * L**2) * np.sqrt(E * I / (rho * A)) for r in roots]
    x = np.linspace(0.0, L, 21)
    shapes = []
    for r in roots:
        be = r / L
        s = (np.cosh(r) - np.cos(r)) / (np.sinh(r) - np.sin(r))
        phi = (np.cosh(be * x) + np.cos(be * x) - s * (np.sinh(be * x) + np.sin(be * x))) / np.sqrt(rho * A * L)
        # check of mass normalisation by quadrature
        xs = np.linspace(0.0, L, 20001)
        ph = (np.cosh(be * xs) + np.cos(be * xs) - s * (np.sinh(be * xs) + np.sin(be * xs))) / np.sqrt(rho * A * L)
        assert abs(rho * A * np.trapezoid(ph * ph, xs) - 1) < 1e-6
        shapes.append(arr(phi))
    write(out_dir, "free-free-bar.json", {"betaL": arr(roots), "fnHz": arr(fn), "x": arr(x), "shapes": shapes})


def main():
    out_dir = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(__file__), "..", "fixtures", "modal")
    os.makedirs(out_dir, exist_ok=True)
    systems(out_dir)
    close_modes_cmif(out_dir)
    free_free_bar(out_dir)


if __name__ == "__main__":
    main()
