// Eigenvalues (no vectors) of a general real matrix: balancing, reduction to upper Hessenberg form by
// stabilised elementary similarity transforms, and the shifted (Francis double-shift) QR iteration — the
// classic EISPACK routines balanc/elmhes/hqr (Wilkinson & Reinsch, "Handbook for Automatic Computation II",
// 1971; as given in Press et al., "Numerical Recipes", 2nd ed., 1992, §11.5–11.6). Used for the roots of
// the LSCF denominator (companion matrices), where eigenvectors are not needed. Internal.

const RADIX = 2;

/**
 * Eigenvalues of the n×n matrix a (row-major; not modified). Returns real and imaginary parts, complex
 * pairs adjacent. Returns null when the QR iteration does not converge (the caller may fall back).
 */
export function eigenvalues(a0: Float64Array, n: number): { re: Float64Array; im: Float64Array } | null {
  const N = n + 1; // 1-based storage a[i*N + j], i, j = 1..n, as in the published routines
  const a = new Float64Array(N * N);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[(i + 1) * N + j + 1] = a0[i * n + j];
  balance(a, n, N);
  hessenberg(a, n, N);
  for (let i = 3; i <= n; i++) for (let j = 1; j <= i - 2; j++) a[i * N + j] = 0;
  const wr = new Float64Array(n + 1);
  const wi = new Float64Array(n + 1);
  if (!hqr(a, n, N, wr, wi)) return null;
  return { re: wr.subarray(1), im: wi.subarray(1) };
}

/** Balances rows and columns by powers of the radix (the eigenvalues are unchanged). */
function balance(a: Float64Array, n: number, N: number): void {
  const sqrdx = RADIX * RADIX;
  let done = false;
  while (!done) {
    done = true;
    for (let i = 1; i <= n; i++) {
      let r = 0;
      let c = 0;
      for (let j = 1; j <= n; j++) {
        if (j !== i) {
          c += Math.abs(a[j * N + i]);
          r += Math.abs(a[i * N + j]);
        }
      }
      if (c !== 0 && r !== 0) {
        let g = r / RADIX;
        let f = 1;
        const s = c + r;
        while (c < g) {
          f *= RADIX;
          c *= sqrdx;
        }
        g = r * RADIX;
        while (c > g) {
          f /= RADIX;
          c /= sqrdx;
        }
        if ((c + r) / f < 0.95 * s) {
          done = false;
          g = 1 / f;
          for (let j = 1; j <= n; j++) a[i * N + j] *= g;
          for (let j = 1; j <= n; j++) a[j * N + i] *= f;
        }
      }
    }
  }
}

/** Reduction to upper Hessenberg form by Gaussian elimination with pivoting (similarity transforms). */
function hessenberg(a: Float64Array, n: number, N: number): void {
  for (let m = 2; m < n; m++) {
    let x = 0;
    let i = m;
    for (let j = m; j <= n; j++) {
      if (Math.abs(a[j * N + m - 1]) > Math.abs(x)) {
        x = a[j * N + m - 1];
        i = j;
      }
    }
    if (i !== m) {
      for (let j = m - 1; j <= n; j++) {
        const t = a[i * N + j];
        a[i * N + j] = a[m * N + j];
        a[m * N + j] = t;
      }
      for (let j = 1; j <= n; j++) {
        const t = a[j * N + i];
        a[j * N + i] = a[j * N + m];
        a[j * N + m] = t;
      }
    }
    if (x !== 0) {
      for (let i2 = m + 1; i2 <= n; i2++) {
        let y = a[i2 * N + m - 1];
        if (y !== 0) {
          y /= x;
          a[i2 * N + m - 1] = y;
          for (let j = m; j <= n; j++) a[i2 * N + j] -= y * a[m * N + j];
          for (let j = 1; j <= n; j++) a[j * N + m] += y * a[j * N + i2];
        }
      }
    }
  }
}

const sign = (a: number, b: number) => (b >= 0 ? Math.abs(a) : -Math.abs(a));

/** Francis double-shift QR on an upper Hessenberg matrix; eigenvalues into wr/wi (1-based). False if not converged. */
function hqr(a: Float64Array, n: number, N: number, wr: Float64Array, wi: Float64Array): boolean {
  let anorm = 0;
  for (let i = 1; i <= n; i++) for (let j = Math.max(i - 1, 1); j <= n; j++) anorm += Math.abs(a[i * N + j]);
  let nn = n;
  // Numerical Recipes' scalar names for the shift and the Householder reflector.
  let [t, p, q, r, s, w, x, y, z] = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  while (nn >= 1) {
    let its = 0;
    let l: number;
    do {
      for (l = nn; l >= 2; l--) {
        s = Math.abs(a[(l - 1) * N + l - 1]) + Math.abs(a[l * N + l]);
        if (s === 0) s = anorm;
        if (Math.abs(a[l * N + l - 1]) + s === s) {
          a[l * N + l - 1] = 0;
          break;
        }
      }
      x = a[nn * N + nn];
      if (l === nn) {
        wr[nn] = x + t;
        wi[nn--] = 0;
      } else {
        y = a[(nn - 1) * N + nn - 1];
        w = a[nn * N + nn - 1] * a[(nn - 1) * N + nn];
        if (l === nn - 1) {
          p = 0.5 * (y - x);
          q = p * p + w;
          z = Math.sqrt(Math.abs(q));
          x += t;
          if (q >= 0) {
            z = p + sign(z, p);
            wr[nn - 1] = wr[nn] = x + z;
            if (z !== 0) wr[nn] = x - w / z;
            wi[nn - 1] = wi[nn] = 0;
          } else {
            wr[nn - 1] = wr[nn] = x + p;
            wi[nn - 1] = -(wi[nn] = z);
          }
          nn -= 2;
        } else {
          if (its === 60) return false;
          if (its === 10 || its === 20 || its === 40) {
            // exceptional shift
            t += x;
            for (let i = 1; i <= nn; i++) a[i * N + i] -= x;
            s = Math.abs(a[nn * N + nn - 1]) + Math.abs(a[(nn - 1) * N + nn - 2]);
            y = x = 0.75 * s;
            w = -0.4375 * s * s;
          }
          ++its;
          let m: number;
          for (m = nn - 2; m >= l; m--) {
            z = a[m * N + m];
            r = x - z;
            s = y - z;
            p = (r * s - w) / a[(m + 1) * N + m] + a[m * N + m + 1];
            q = a[(m + 1) * N + m + 1] - z - r - s;
            r = a[(m + 2) * N + m + 1];
            s = Math.abs(p) + Math.abs(q) + Math.abs(r);
            p /= s;
            q /= s;
            r /= s;
            if (m === l) break;
            const u = Math.abs(a[m * N + m - 1]) * (Math.abs(q) + Math.abs(r));
            const v = Math.abs(p) * (Math.abs(a[(m - 1) * N + m - 1]) + Math.abs(z) + Math.abs(a[(m + 1) * N + m + 1]));
            if (u + v === v) break;
          }
          for (let i = m + 2; i <= nn; i++) {
            a[i * N + i - 2] = 0;
            if (i !== m + 2) a[i * N + i - 3] = 0;
          }
          for (let k = m; k <= nn - 1; k++) {
            if (k !== m) {
              p = a[k * N + k - 1];
              q = a[(k + 1) * N + k - 1];
              r = 0;
              if (k !== nn - 1) r = a[(k + 2) * N + k - 1];
              x = Math.abs(p) + Math.abs(q) + Math.abs(r);
              if (x !== 0) {
                p /= x;
                q /= x;
                r /= x;
              }
            }
            s = sign(Math.sqrt(p * p + q * q + r * r), p);
            if (s !== 0) {
              if (k === m) {
                if (l !== m) a[k * N + k - 1] = -a[k * N + k - 1];
              } else a[k * N + k - 1] = -s * x;
              p += s;
              x = p / s;
              y = q / s;
              z = r / s;
              q /= p;
              r /= p;
              for (let j = k; j <= nn; j++) {
                p = a[k * N + j] + q * a[(k + 1) * N + j];
                if (k !== nn - 1) {
                  p += r * a[(k + 2) * N + j];
                  a[(k + 2) * N + j] -= p * z;
                }
                a[(k + 1) * N + j] -= p * y;
                a[k * N + j] -= p * x;
              }
              const mmin = nn < k + 3 ? nn : k + 3;
              for (let i = l; i <= mmin; i++) {
                p = x * a[i * N + k] + y * a[i * N + k + 1];
                if (k !== nn - 1) {
                  p += z * a[i * N + k + 2];
                  a[i * N + k + 2] -= p * r;
                }
                a[i * N + k + 1] -= p * q;
                a[i * N + k] -= p;
              }
            }
          }
        }
      }
    } while (l < nn - 1);
  }
  return true;
}
