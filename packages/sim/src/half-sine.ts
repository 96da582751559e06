import { requireFinite, requireInteger, requireNonNegative, requirePositive } from './validate.ts';

/**
 * One half-sine force pulse, the usual model of a hammer contact (docs/methods.md#pulse-spectra):
 * f(t) = A·sin(π(t − t₀)/T) for t₀ ≤ t ≤ t₀ + T, else 0.
 * Its impulse is 2AT/π (N·s) and its spectrum (2AT/π)·cos(πfT)/(1 − 4f²T²)·e^{−jπfT}·e^{−j2πft₀}.
 */
export interface HalfSinePulse {
  /** t₀: start of contact, s from the first sample of the record. */
  startS: number;
  /** A: peak force, N. */
  amplitudeN: number;
  /** T: contact time, s (a harder tip gives a shorter contact). */
  widthS: number;
}

function checkPulse(pulse: HalfSinePulse, name = 'pulse'): void {
  requireNonNegative(`${name}.startS`, pulse?.startS);
  requireFinite(`${name}.amplitudeN`, pulse.amplitudeN);
  requirePositive(`${name}.widthS`, pulse.widthS);
}

/** Impulse of a half-sine pulse, ∫f dt = 2AT/π, N·s (docs/methods.md#pulse-spectra). */
export function halfSineImpulse(amplitudeN: number, widthS: number): number {
  requireFinite('amplitudeN', amplitudeN);
  requirePositive('widthS', widthS);
  return (2 * amplitudeN * widthS) / Math.PI;
}

/**
 * Analytic continuous spectrum of a half-sine pulse starting at t = 0 (docs/methods.md#pulse-spectra):
 * X(f) = (2AT/π)·cos(πfT)/(1 − 4f²T²)·e^{−jπfT}, N·s, forward transform e^{−j2πft} (docs/methods.md#conventions).
 * The removable 0/0 at f = 1/(2T) is evaluated by its limit, |X| = AT/2.
 */
export function halfSineSpectrum(amplitudeN: number, widthS: number, fHz: ArrayLike<number>): { re: Float64Array; im: Float64Array } {
  const x0 = halfSineImpulse(amplitudeN, widthS);
  const re = new Float64Array(fHz.length);
  const im = new Float64Array(fHz.length);
  for (let i = 0; i < fHz.length; i++) {
    const f = requireFinite(`fHz[${i}]`, fHz[i]);
    const u = f * widthS;
    const den = 1 - 4 * u * u;
    // Near u = ½ use the limit cos(πu)/(1 − 4u²) → π/4.
    const mag = Math.abs(den) < 1e-9 ? (x0 * Math.PI) / 4 : (x0 * Math.cos(Math.PI * u)) / den;
    re[i] = mag * Math.cos(Math.PI * u);
    im[i] = -mag * Math.sin(Math.PI * u);
  }
  return { re, im };
}

/**
 * Samples of a train of half-sine pulses at t_n = n/fs, n = 0…samples−1, added into `out`
 * (a new zeroed array when omitted). Units follow the amplitudes (N).
 */
export function halfSineForce(pulses: HalfSinePulse[], fs: number, samples: number, out?: Float64Array): Float64Array {
  requirePositive('fs', fs);
  requireInteger('samples', samples, 1);
  const result = out ?? new Float64Array(samples);
  if (result.length !== samples) throw new RangeError(`out.length=${result.length} must equal samples=${samples}`);
  pulses.forEach((p, i) => checkPulse(p, `pulses[${i}]`));
  const dt = 1 / fs;
  for (const { startS, amplitudeN, widthS } of pulses) {
    const first = Math.max(0, Math.ceil(startS * fs));
    const last = Math.min(samples - 1, Math.floor((startS + widthS) * fs));
    const omega = Math.PI / widthS;
    for (let n = first; n <= last; n++) {
      const tau = n * dt - startS;
      if (tau < 0 || tau > widthS) continue; // guard against rounding in ceil/floor
      result[n] += amplitudeN * Math.sin(omega * tau);
    }
  }
  return result;
}

/**
 * Adds gain·q^{(p)}(t_n) into `out`, where q is the exact response of the unit-mass SDOF
 * q̈ + 2ζω_n q̇ + ω_n² q = f(t) to one half-sine pulse f, starting from rest.
 *
 * Derivation (Duhamel integral in closed form). With σ = ζω_n, ω_d = ω_n√(1 − ζ²),
 * λ = −σ + jω_d, the impulse response is h(t) = e^{−σt} sin(ω_d t)/ω_d = 2Re[c·e^{λt}],
 * c = 1/(2jω_d) (docs/methods.md#impulse-response). Write the pulse as A(e^{s₊τ} − e^{s₋τ})/(2j) with
 * s± = ±jπ/T. Since ∫₀ᵘ e^{λ(τ−v)} e^{sv} dv = e^{λτ}(e^{(s−λ)u} − 1)/(s − λ):
 *   0 ≤ τ ≤ T:  q(τ) = 2Re[ Σ± K± (e^{s±τ} − e^{λτ}) ],
 *   τ > T:      q(τ) = 2Re[ Σ± K± (e^{(s±−λ)T} − 1) e^{λτ} ],
 * with K₊ = −A/(4ω_d(s₊ − λ)), K₋ = +A/(4ω_d(s₋ − λ)) (c·A/(2j) = −A/(4ω_d) is real).
 * Each time derivative multiplies a term by its exponent (s± or λ), so velocity and
 * acceleration are exact too. A rigid-body mode (ω_n = 0) has q̈ = f exactly.
 */
export function addSdofHalfSineResponse(
  out: Float64Array,
  omegaN: number,
  zeta: number,
  pulse: HalfSinePulse,
  fs: number,
  gain: number,
  derivative: 0 | 1 | 2,
): void {
  const { startS, amplitudeN: A, widthS: T } = pulse;
  const dt = 1 / fs;
  const W = Math.PI / T;
  const n0 = Math.max(0, Math.ceil(startS * fs));
  const N = out.length;

  if (omegaN === 0) {
    for (let n = n0; n < N; n++) {
      const tau = n * dt - startS;
      if (tau < 0) continue;
      let v: number;
      if (tau <= T) {
        v = derivative === 2 ? A * Math.sin(W * tau) : derivative === 1 ? (A / W) * (1 - Math.cos(W * tau)) : (A / W) * (tau - Math.sin(W * tau) / W);
      } else {
        v = derivative === 2 ? 0 : derivative === 1 ? (2 * A) / W : (A / W) * T + ((2 * A) / W) * (tau - T);
      }
      out[n] += gain * v;
    }
    return;
  }

  const sigma = zeta * omegaN;
  const wd = omegaN * Math.sqrt(1 - zeta * zeta);
  const lamRe = -sigma;
  const lamIm = wd;
  // s₊ − λ = σ + j(W − ω_d); s₋ − λ = σ − j(W + ω_d).
  const [kpRe, kpIm] = cdiv(-A / (4 * wd), 0, sigma, W - wd);
  const [kmRe, kmIm] = cdiv(A / (4 * wd), 0, sigma, -(W + wd));
  // Powers s^p and λ^p.
  const [spRe, spIm] = cpow(0, W, derivative);
  const [smRe, smIm] = cpow(0, -W, derivative);
  const [lpRe, lpIm] = cpow(lamRe, lamIm, derivative);
  // P1 = K₊ s₊^p, P2 = K₋ s₋^p, P3 = −(K₊ + K₋) λ^p.
  const [p1Re, p1Im] = cmul(kpRe, kpIm, spRe, spIm);
  const [p2Re, p2Im] = cmul(kmRe, kmIm, smRe, smIm);
  const [p3Re, p3Im] = cmul(-(kpRe + kmRe), -(kpIm + kmIm), lpRe, lpIm);
  // B = K₊(e^{(s₊−λ)T} − 1) + K₋(e^{(s₋−λ)T} − 1); P4 = B λ^p.
  const eS = Math.exp(sigma * T);
  const [bpRe, bpIm] = cmul(kpRe, kpIm, eS * Math.cos((W - wd) * T) - 1, eS * Math.sin((W - wd) * T));
  const [bmRe, bmIm] = cmul(kmRe, kmIm, eS * Math.cos(-(W + wd) * T) - 1, eS * Math.sin(-(W + wd) * T));
  const [p4Re, p4Im] = cmul(bpRe + bmRe, bpIm + bmIm, lpRe, lpIm);
  const g2 = 2 * gain;

  // During the contact: evaluate directly (a few dozen samples at most).
  let n = n0;
  for (; n < N; n++) {
    const tau = n * dt - startS;
    if (tau > T) break;
    if (tau < 0) continue;
    const decay = Math.exp(-sigma * tau);
    const cd = Math.cos(wd * tau);
    const sd = Math.sin(wd * tau);
    const c = Math.cos(W * tau);
    const s = Math.sin(W * tau);
    // Re[P1 e^{jWτ}] + Re[P2 e^{−jWτ}] + Re[P3 e^{λτ}]
    const v = p1Re * c - p1Im * s + (p2Re * c + p2Im * s) + decay * (p3Re * cd - p3Im * sd);
    out[n] += g2 * v;
  }
  // Free vibration: Re[P4 e^{λτ}]. The phasor e^{λτ} advances by e^{λΔt} per sample and is
  // re-seeded exactly every 256 samples, which keeps the rounding drift below ~1e-13.
  const stepDecay = Math.exp(-sigma * dt);
  const stepRe = stepDecay * Math.cos(wd * dt);
  const stepIm = stepDecay * Math.sin(wd * dt);
  while (n < N) {
    const tau = n * dt - startS;
    const decay = Math.exp(-sigma * tau);
    let zRe = decay * Math.cos(wd * tau);
    let zIm = decay * Math.sin(wd * tau);
    const end = Math.min(N, n + 256);
    for (; n < end; n++) {
      out[n] += g2 * (p4Re * zRe - p4Im * zIm);
      const t = zRe * stepRe - zIm * stepIm;
      zIm = zRe * stepIm + zIm * stepRe;
      zRe = t;
    }
  }
}

function cmul(aRe: number, aIm: number, bRe: number, bIm: number): [number, number] {
  return [aRe * bRe - aIm * bIm, aRe * bIm + aIm * bRe];
}

function cdiv(aRe: number, aIm: number, bRe: number, bIm: number): [number, number] {
  const d = bRe * bRe + bIm * bIm;
  return [(aRe * bRe + aIm * bIm) / d, (aIm * bRe - aRe * bIm) / d];
}

function cpow(re: number, im: number, p: 0 | 1 | 2): [number, number] {
  if (p === 0) return [1, 0];
  if (p === 1) return [re, im];
  return cmul(re, im, re, im);
}

export interface SdofHalfSineInput {
  /** Undamped natural frequency, Hz (0 for a free mass). */
  fnHz: number;
  /** Damping ratio, 0 < ζ < 1 (ignored when fnHz = 0). */
  zeta: number;
  /** Modal (or physical) mass, kg; default 1 (a mass-normalised mode). */
  massKg?: number;
  pulse: HalfSinePulse;
  fs: number;
  samples: number;
  /** 0: displacement (m), 1: velocity (m/s), 2: acceleration (m/s²). Default 2. */
  derivative?: 0 | 1 | 2;
}

/**
 * Exact response of an SDOF m·ẍ + c·ẋ + k·x = f(t) (c = 2ζ√(km)), starting from rest, to a
 * half-sine force pulse, sampled at t_n = n/fs — no time-stepping error (see
 * addSdofHalfSineResponse for the closed form). Returns displacement (m), velocity (m/s) or
 * acceleration (m/s²).
 */
export function sdofHalfSineResponse(input: SdofHalfSineInput): Float64Array {
  const fn = requireNonNegative('fnHz', input?.fnHz);
  const zeta = fn > 0 ? requireFinite('zeta', input.zeta) : 0;
  if (fn > 0 && !(zeta > 0 && zeta < 1)) throw new RangeError(`zeta=${zeta} must be in (0, 1)`);
  const mass = requirePositive('massKg', input.massKg ?? 1);
  const fs = requirePositive('fs', input.fs);
  const samples = requireInteger('samples', input.samples, 1);
  checkPulse(input.pulse);
  const derivative = input.derivative ?? 2;
  if (derivative !== 0 && derivative !== 1 && derivative !== 2) {
    throw new RangeError(`derivative=${String(derivative)} must be 0, 1 or 2`);
  }
  const out = new Float64Array(samples);
  addSdofHalfSineResponse(out, 2 * Math.PI * fn, zeta, input.pulse, fs, 1 / mass, derivative);
  return out;
}
