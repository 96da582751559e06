// Independent numerical tools for the tests. Nothing here calls the code under test.

/**
 * Transient spectrum at an arbitrary frequency: X(f) = Δt·Σ x_n e^{−j2πf nΔt}
 * (docs/methods.md#transient-spectrum, the DFT evaluated off the bin grid; forward sign e^{−j2πft}, docs/methods.md#conventions).
 */
export function dtft(x: ArrayLike<number>, fs: number, f: number): { re: number; im: number } {
  const dt = 1 / fs;
  const w = 2 * Math.PI * f * dt;
  // Rotate a phasor instead of calling cos/sin per sample; re-seed every 1024 samples to bound drift.
  let re = 0;
  let im = 0;
  for (let start = 0; start < x.length; start += 1024) {
    let cr = Math.cos(w * start);
    let ci = -Math.sin(w * start);
    const sr = Math.cos(w);
    const si = -Math.sin(w);
    const end = Math.min(x.length, start + 1024);
    for (let n = start; n < end; n++) {
      re += x[n] * cr;
      im += x[n] * ci;
      const t = cr * sr - ci * si;
      ci = cr * si + ci * sr;
      cr = t;
    }
  }
  return { re: re * dt, im: im * dt };
}

export function cdiv(a: { re: number; im: number }, b: { re: number; im: number }): { re: number; im: number } {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

export function cabs(a: { re: number; im: number }): number {
  return Math.hypot(a.re, a.im);
}

/** Phase difference a/b in degrees, wrapped to (−180, 180]. */
export function phaseDiffDeg(a: { re: number; im: number }, b: { re: number; im: number }): number {
  const q = cdiv(a, b);
  return (Math.atan2(q.im, q.re) * 180) / Math.PI;
}

/** Half-sine force train evaluated at any t (for the integrator's midpoints). */
export function halfSineAt(t: number, pulses: { startS: number; amplitudeN: number; widthS: number }[]): number {
  let f = 0;
  for (const p of pulses) {
    const tau = t - p.startS;
    if (tau >= 0 && tau <= p.widthS) f += p.amplitudeN * Math.sin((Math.PI * tau) / p.widthS);
  }
  return f;
}

/**
 * Classical 4th-order Runge–Kutta integration of M ẍ + C ẋ + K x = b·f(t) from rest, for small
 * dense matrices. Records the acceleration ẍ = M⁻¹(b f − C ẋ − K x) at every `every`-th step
 * (M must be diagonal here, which is all the tests need).
 */
export function rk4Accelerations(
  M: number[][],
  C: number[][],
  K: number[][],
  b: number[],
  force: (t: number) => number,
  h: number,
  steps: number,
  every: number,
): number[][] {
  const n = M.length;
  const acc = (t: number, x: number[], v: number[]): number[] => {
    const f = force(t);
    const out = new Array<number>(n);
    for (let i = 0; i < n; i++) {
      let s = b[i] * f;
      for (let j = 0; j < n; j++) s -= C[i][j] * v[j] + K[i][j] * x[j];
      out[i] = s / M[i][i];
    }
    return out;
  };
  let x = new Array<number>(n).fill(0);
  let v = new Array<number>(n).fill(0);
  const out: number[][] = Array.from({ length: n }, () => []);
  const record = (t: number) => {
    const a = acc(t, x, v);
    for (let i = 0; i < n; i++) out[i].push(a[i]);
  };
  record(0);
  for (let k = 0; k < steps; k++) {
    const t = k * h;
    const a1 = acc(t, x, v);
    const x2 = x.map((xi, i) => xi + 0.5 * h * v[i]);
    const v2 = v.map((vi, i) => vi + 0.5 * h * a1[i]);
    const a2 = acc(t + 0.5 * h, x2, v2);
    const x3 = x.map((xi, i) => xi + 0.5 * h * v2[i]);
    const v3 = v.map((vi, i) => vi + 0.5 * h * a2[i]);
    const a3 = acc(t + 0.5 * h, x3, v3);
    const x4 = x.map((xi, i) => xi + h * v3[i]);
    const v4 = v.map((vi, i) => vi + h * a3[i]);
    const a4 = acc(t + h, x4, v4);
    x = x.map((xi, i) => xi + (h / 6) * (v[i] + 2 * v2[i] + 2 * v3[i] + v4[i]));
    v = v.map((vi, i) => vi + (h / 6) * (a1[i] + 2 * a2[i] + 2 * a3[i] + a4[i]));
    if ((k + 1) % every === 0) record((k + 1) * h);
  }
  return out;
}

/** Composite Simpson rule of g on [a, b] with an even number of intervals. */
export function simpson(g: (x: number) => number, a: number, b: number, intervals: number): number {
  const h = (b - a) / intervals;
  let s = g(a) + g(b);
  for (let i = 1; i < intervals; i++) s += (i % 2 === 1 ? 4 : 2) * g(a + i * h);
  return (s * h) / 3;
}
