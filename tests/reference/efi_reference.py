#!/usr/bin/env python3
"""Reference fixtures for packages/dsp/src/correlation, computed with numpy and scipy (outside the project).

Usage: python3 tests/reference/efi_reference.py [output-dir]   (default: tests/fixtures/correlation)

efi-beam.json
    Effective Independence (Kammer 1991, J. Guidance, Control, and Dynamics 14(2)) on a uniform simply
    supported beam: 41 equally spaced candidates x_i = i*L/40 (supports included), target modes
    sin(n*pi*x/L), n = 1, 2, 3 (Blevins 1979). numpy's own implementation of Kammer's iteration, E_D
    recomputed from scratch at every step as diag(Phi inv(Phi^T Phi) Phi^T), deletes the candidate with
    the smallest E_D (ties: within 1e-9 * max E_D of the smallest, the lowest index goes first) down to
    3 candidates, recording the order, E_D and log det(Phi^T Phi) at each step. An exhaustive search of
    all C(41, 5) five-sensor sets by det(Phi^T Phi) is recorded too.

spring-chain.json
    A fixed-fixed chain of five lumped masses and six springs (known M, K), its modes by
    scipy.linalg.eigh(K, M) (mass-normalised, ascending), and the same chain with spring 3 stiffened by
    5 %; MAC matrix (numpy), frequency differences in %, Phi_test^T M Phi_model, and the SEREP
    pseudo-orthogonality (O'Callahan, Avitabile & Riemer 1989) on three of the five DOFs.
Deterministic.
"""
import itertools
import json
import os
import sys

import numpy as np
import scipy
from scipy import linalg


def arr(x):
    return [float(v) for v in np.asarray(x, dtype=float).ravel()]


def write(out_dir, name, payload):
    payload["versions"] = {"numpy": np.__version__, "scipy": scipy.__version__}
    with open(os.path.join(out_dir, name), "w", encoding="utf-8") as fh:
        json.dump(payload, fh, separators=(",", ":"))
        fh.write("\n")


def efi(phi, target):
    """Kammer's iteration, from scratch each step. phi: candidates x modes."""
    idx = list(range(phi.shape[0]))
    steps = []
    while len(idx) > target:
        p = phi[idx]
        a = p.T @ p
        ed = np.sum((p @ np.linalg.inv(a)) * p, axis=1)
        tol = 1e-9 * ed.max()
        j = next(k for k in range(len(idx)) if ed[k] <= ed.min() + tol)
        removed = idx[j]
        del idx[j]
        q = phi[idx]
        steps.append({
            "removed": removed,
            "edRemoved": float(ed[j]),
            "ed": arr(ed),
            "logDetFisher": float(np.linalg.slogdet(q.T @ q)[1]),
        })
    p = phi[idx]
    ed = np.sum((p @ np.linalg.inv(p.T @ p)) * p, axis=1)
    return idx, steps, ed


def beam(out_dir):
    n_cand, n_modes, n_sensors = 41, 3, 5
    x = np.arange(n_cand) / (n_cand - 1)  # x/L
    phi = np.stack([np.sin(k * np.pi * x) for k in range(1, n_modes + 1)], axis=1)
    kept, steps, ed = efi(phi, n_modes)
    kept5, _, ed5 = efi(phi, n_sensors)
    a0 = phi.T @ phi
    ed0 = np.sum((phi @ np.linalg.inv(a0)) * phi, axis=1)
    combs = np.array(list(itertools.combinations(range(n_cand), n_sensors)))
    p = phi[combs]
    dets = np.linalg.det(np.einsum("cij,cik->cjk", p, p))
    best = int(np.argmax(dets))
    write(out_dir, "efi-beam.json", {
        "xOverL": arr(x),
        "shapes": [arr(phi[:, r]) for r in range(n_modes)],  # one vector per mode
        "initialEd": arr(ed0),
        "initialLogDetFisher": float(np.linalg.slogdet(a0)[1]),
        "fullRun": {"target": n_modes, "kept": kept, "steps": steps, "finalEd": arr(ed)},
        "fiveSensors": {"kept": kept5, "finalEd": arr(ed5), "logDetFisher": float(np.log(np.linalg.det(phi[kept5].T @ phi[kept5])))},
        "exhaustive": {"sets": int(len(combs)), "best": [int(v) for v in combs[best]], "bestDet": float(dets[best])},
    })


def chain_matrices(m, k):
    n = len(m)
    K = np.zeros((n, n))
    for i in range(n):
        K[i, i] = k[i] + k[i + 1]
        if i + 1 < n:
            K[i, i + 1] = K[i + 1, i] = -k[i + 1]
    return np.diag(m), K


def modes(M, K):
    w2, phi = linalg.eigh(K, M)
    # sign rule: the largest-magnitude entry of each shape is positive
    for r in range(phi.shape[1]):
        if phi[np.argmax(np.abs(phi[:, r])), r] < 0:
            phi[:, r] *= -1
    return np.sqrt(w2) / (2 * np.pi), phi


def mac(a, b):
    return float((a @ b) ** 2 / ((a @ a) * (b @ b)))


def chain(out_dir):
    m = np.array([1.0, 1.5, 2.0, 1.5, 1.2])  # kg
    k = np.array([1000.0, 1200.0, 900.0, 1100.0, 1000.0, 800.0])  # N/m, k[0] to ground, k[5] to ground
    M, K = chain_matrices(m, k)
    k_test = k.copy()
    k_test[2] *= 1.05  # spring 3 (between masses 2 and 3) 5 % stiffer in the "test" structure
    _, K_test = chain_matrices(m, k_test)
    f_model, phi_model = modes(M, K)
    f_test, phi_test = modes(M, K_test)
    n = len(m)
    mac_tm = [[mac(phi_test[:, i], phi_model[:, j]) for j in range(n)] for i in range(n)]
    a_set = [0, 2, 4]
    r = 3  # modes kept in the SEREP reduction
    pa = phi_model[a_set, :r]
    pinv = np.linalg.pinv(pa)
    m_serep = pinv.T @ pinv
    write(out_dir, "spring-chain.json", {
        "massesKg": arr(m),
        "springsNPerM": arr(k),
        "stiffenedSpring": 2,
        "M": [arr(row) for row in M],
        "K": [arr(row) for row in K],
        "Ktest": [arr(row) for row in K_test],
        "model": {"fHz": arr(f_model), "shapes": [arr(phi_model[:, j]) for j in range(n)]},
        "test": {"fHz": arr(f_test), "shapes": [arr(phi_test[:, j]) for j in range(n)]},
        "macTestModel": mac_tm,
        "freqDiffPercent": arr((f_test - f_model) / f_model * 100),
        "crossOrthogonality": [arr(row) for row in phi_test.T @ M @ phi_model],
        "serep": {
            "aSet": a_set,
            "modes": r,
            "reducedMass": [arr(row) for row in m_serep],
            "pseudoOrthogonalityTestModel": [arr(row) for row in phi_test[a_set, :r].T @ m_serep @ pa],
        },
    })


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out_dir = sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "..", "fixtures", "correlation")
    os.makedirs(out_dir, exist_ok=True)
    beam(out_dir)
    chain(out_dir)


if __name__ == "__main__":
    main()
