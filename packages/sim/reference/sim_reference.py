"""Reference values for the @resonote/sim tests.

Run:  python3 packages/sim/reference/sim_reference.py
Computed with numpy / scipy / mpmath (numpy 2.4.6, scipy 1.17.1, mpmath 1.3.0 when written).
The tests quote the printed numbers beside each assertion and name this script as their source.
Nothing here imports the TypeScript code: it is an independent implementation.
"""
import numpy as np
from scipy.optimize import brentq
import mpmath as mp

np.set_printoptions(precision=12)

# --- Free-free Euler-Bernoulli beam: roots of cos(x) cosh(x) = 1 (docs/methods.md#free-free-beam) ---
g = lambda x: np.cos(x) - 1.0 / np.cosh(x)
roots = [brentq(g, (n + 0.5) * np.pi - 0.5, (n + 0.5) * np.pi + 0.5, xtol=1e-15) for n in range(1, 31)]
print("betaL 1..5:", ["%.9f" % r for r in roots[:5]])
print("betaL 10, 20, 30:", ["%.12f" % roots[i] for i in (9, 19, 29)])

# Bar of docs/methods.md#free-free-beam
L, b, h, E, rho = 1.0, 0.040, 0.010, 210e9, 7850.0
rhoA = rho * b * h
for name, I in (("weak", b * h**3 / 12), ("stiff", h * b**3 / 12)):
    c = np.sqrt(E * I / rhoA)
    print(name, "f (Hz):", ["%.6f" % (r**2 / (2 * np.pi * L**2) * c) for r in roots[:5]])

# High-precision mode shape values (mpmath, 80 digits) for the stability test: mode 20 and 30
mp.mp.dps = 80
def shape_mp(n, xi):
    # unnormalised free-free shape at x/L = xi, with the exact root refined in mpmath
    bl = mp.findroot(lambda x: mp.cos(x) - 1 / mp.cosh(x), roots[n - 1])
    s = (mp.cosh(bl) - mp.cos(bl)) / (mp.sinh(bl) - mp.sin(bl))
    u = bl * xi
    return mp.cosh(u) + mp.cos(u) - s * (mp.sinh(u) + mp.sin(u))
for n in (20, 30):
    print("mode", n, "unnormalised shape at x/L = 0.13, 0.5, 0.77, 1.0:",
          ["%.12f" % shape_mp(n, mp.mpf(x)) for x in ("0.13", "0.5", "0.77", "1.0")])

# --- SDOF, m = 1 kg, fn = 100 Hz, zeta = 0.02 (docs/methods.md#frf-kinds) ---
m, fn, z = 1.0, 100.0, 0.02
wn = 2 * np.pi * fn
k, c = m * wn**2, 2 * z * m * wn
for f in (0.0, 50.0, 100.0, 150.0):
    w = 2 * np.pi * f
    a = 1 / (k - m * w**2 + 1j * c * w)
    print("SDOF f=%g: receptance %r mobility %r accelerance %r" % (f, a, 1j * w * a, -w**2 * a))

# --- 2-DOF chain of docs/methods.md#chain-2dof, Rayleigh damping giving 2 % in both modes ---
M = np.eye(2); K = np.array([[2000.0, -1000.0], [-1000.0, 2000.0]])
w1, w2 = np.sqrt(1000.0), np.sqrt(3000.0)
bR = 2 * 0.02 / (w1 + w2); aR = 2 * 0.02 * w1 * w2 / (w1 + w2)
C = aR * M + bR * K
for f in (6.0, w1 / (2 * np.pi), w2 / (2 * np.pi), 2.0, 12.0):
    w = 2 * np.pi * f
    A = np.linalg.inv(K - w**2 * M + 1j * w * C)
    print("2DOF f=%.9f: a11 %r a12 %r" % (f, A[0, 0], A[0, 1]))

# --- Half-sine spectra (docs/methods.md#pulse-spectra, #double-hit) sampled as the simulator samples them ---
fs, N, A0, T = 51200.0, 8192, 100.0, 1e-3
t = np.arange(N) / fs
x = np.where(t <= T, A0 * np.sin(np.pi * t / T), 0.0)
print("half-sine fs=51.2k N=8192: X(0) = %.9f" % (x.sum() / fs))
x2 = x + np.where((t >= 5e-3) & (t <= 6e-3), A0 * np.sin(np.pi * (t - 5e-3) / T), 0.0)
for f in (100.0, 200.0, 300.0):
    X = np.sum(x2 * np.exp(-2j * np.pi * f * t)) / fs
    print("double half-sine |X(%g)| = %.9f" % (f, abs(X)))

# --- Invented pump-skid baseplate (src/pump-skid.ts), an independent re-implementation ---
# Warburton's rectangular-plate approximation with free-free beam characteristic numbers,
# and rigid-plate-on-four-springs mount modes. Approximate demo data; this only checks the code.
a, b, h, E, nu, rho = 1.2, 0.8, 0.02, 210e9, 0.3, 7850.0
D = E * h**3 / (12 * (1 - nu**2)); base = np.pi**4 * D / (a**4 * rho * h); r = a / b
def GHJ(m):
    if m == 0: return 0.0, 0.0, 0.0
    if m == 1: return 0.0, 0.0, 12 / np.pi**2
    G = roots[m - 2] / np.pi
    if m == 2: return G, 1.248, 5.017
    g = m - 0.5
    return G, g * g * (1 - 2 / (g * np.pi)), g * g * (1 + 6 / (g * np.pi))
plate = []
for m in range(8):
    for n in range(8):
        if m + n <= 1: continue
        Gx, Hx, Jx = GHJ(m); Gy, Hy, Jy = GHJ(n)
        w2 = base * (Gx**4 + Gy**4 * r**4 + 2 * r**2 * (nu * Hx * Hy + (1 - nu) * Jx * Jy))
        plate.append((np.sqrt(w2) / (2 * np.pi), m, n))
plate = sorted(p for p in plate if p[0] <= 400)
print("plate modes <= 400 Hz (f, m, n):", [("%.6f" % f, m, n) for f, m, n in plate])
Mp = rho * a * b * h; k = 1e5
print("mount modes (bounce, roll, pitch) Hz: %.6f %.6f %.6f" % (
    np.sqrt(4 * k / Mp) / (2 * np.pi),
    np.sqrt(4 * k * 0.3**2 / (Mp * b * b / 12)) / (2 * np.pi),
    np.sqrt(4 * k * 0.5**2 / (Mp * a * a / 12)) / (2 * np.pi)))
