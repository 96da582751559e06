#!/usr/bin/env python3
"""Reference modes of a non-uniform spring-mass chain (the structure of packages/dsp/test/structures.ts,
`chain()`), by scipy.linalg.eigh of the generalized eigenproblem K phi = w^2 M phi.

Writes chain.json into the directory given (default tests/fixtures/structures): natural frequencies (Hz)
and mass-normalised shapes (phi^T M phi = I, the normalisation eigh returns for the pair (K, M)), each
shape signed so that its largest entry is positive.
Run: python3 tests/reference/chain_modes.py [outdir]
"""
import json
import os
import sys

import numpy as np
import scipy
import scipy.linalg

# 8 masses (kg) between two walls, 9 springs (N/m): invented values, the same as chain() in structures.ts
MASSES = [1.2, 0.8, 1.5, 1.0, 2.0, 0.9, 1.3, 1.1]
SPRINGS = [4.0e5, 3.0e5, 5.0e5, 2.5e5, 4.5e5, 3.5e5, 2.0e5, 4.0e5, 3.0e5]


def main() -> None:
    out = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(__file__), '..', 'fixtures', 'structures')
    n = len(MASSES)
    M = np.diag(MASSES)
    K = np.zeros((n, n))
    for i in range(n):
        K[i, i] = SPRINGS[i] + SPRINGS[i + 1]
        if i + 1 < n:
            K[i, i + 1] = K[i + 1, i] = -SPRINGS[i + 1]
    w2, phi = scipy.linalg.eigh(K, M)
    for r in range(n):
        if phi[np.argmax(np.abs(phi[:, r])), r] < 0:
            phi[:, r] = -phi[:, r]
    data = {
        'source': 'scipy.linalg.eigh(K, M), tests/reference/chain_modes.py',
        'versions': {'numpy': np.__version__, 'scipy': scipy.__version__},
        'masses': MASSES,
        'springs': SPRINGS,
        'fHz': [float(np.sqrt(x) / (2 * np.pi)) for x in w2],
        'phi': [[float(v) for v in phi[:, r]] for r in range(n)],
    }
    os.makedirs(out, exist_ok=True)
    with open(os.path.join(out, 'chain.json'), 'w') as fh:
        json.dump(data, fh, indent=1)
        fh.write('\n')


if __name__ == '__main__':
    main()
