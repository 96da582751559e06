import { describe, expect, it } from 'vitest';
import { cabs, cdiv, dtft, halfSineAt, phaseDiffDeg, rk4Accelerations } from '../test/helpers.ts';
import { modelFrf } from './frf.ts';
import type { ModalModel } from './modal-model.ts';
import { createRng } from './rng.ts';
import { hitSeries, simulateHit, type HitOptions } from './simulate-hit.ts';
import { steelBar } from './steel-bar.ts';

// SDOF of docs/methods.md#frf-kinds (m = 1 kg, f_n = 100 Hz, ζ = 0.02) as a one-mode model.
const sdof: ModalModel = { modes: [{ fnHz: 100, zeta: 0.02, shape: { '1:+Z': 1, '2:+Z': 0.5 } }] };

const base: HitOptions = {
  excitationDof: '1:+Z',
  responseDofs: ['1:+Z'],
  fs: 8192,
  samples: 16384, // 2 s: 25 envelope time constants of the 100 Hz, 2 % mode (τ_r = 1/(ζω) = 0.080 s, docs/methods.md#record-length)
  preTriggerS: 0.01,
  peakForceN: 100,
  pulseWidthS: 1e-3,
  forceRangeN: 500,
  responseRangeMs2: 5000,
  adcBits: 24,
};

describe('simulateHit: response correctness', () => {
  it('gives Δt·DFT(a)/Δt·DFT(f) equal to the closed-form accelerance within 1 % and 1° over 0.5–1.5 f_n', () => {
    const hit = simulateHit(sdof, base, createRng(1));
    const f = Array.from({ length: 41 }, (_, i) => 50 + i * 2.5);
    const exact = modelFrf(sdof, '1:+Z', '1:+Z', f, 'accelerance');
    f.forEach((fk, i) => {
      const h = cdiv(dtft(hit.responses[0], base.fs, fk), dtft(hit.force, base.fs, fk));
      const ref = { re: exact.re[i], im: exact.im[i] };
      expect(Math.abs(cabs(h) / cabs(ref) - 1)).toBeLessThan(0.01);
      expect(Math.abs(phaseDiffDeg(h, ref))).toBeLessThan(1);
    });
  });

  it('is exact enough that the same ratio matches to 1e-4 on the noise-free clean signals', () => {
    const hit = simulateHit(sdof, base, createRng(1));
    const exact = modelFrf(sdof, '2:+Z', '1:+Z', [100], 'accelerance');
    const withTransfer = simulateHit(sdof, { ...base, responseDofs: ['2:+Z'] }, createRng(1));
    const h = cdiv(dtft(withTransfer.truth.cleanResponses[0], base.fs, 100), dtft(hit.truth.cleanForce, base.fs, 100));
    // A(ω_n) = φ₂φ₁·j/(2ζ) = 12.5 j (docs/methods.md#frf-kinds scaled by the shape product 0.5)
    expect(Math.abs(exact.im[0] - 12.5)).toBeLessThan(1e-12);
    expect(Math.abs(h.re - exact.re[0])).toBeLessThan(1e-4 * 12.5);
    expect(Math.abs(h.im - exact.im[0])).toBeLessThan(1e-4 * 12.5);
  });

  it('matches the shifted FRF H(s + 1/τ) when the same exponential window is applied to both channels (docs/methods.md#exp-window)', () => {
    // A 0.5 s record: without a window the response is cut at e^{−6.3} ≈ 0.2 % of its envelope.
    const opts = { ...base, samples: 4096 };
    const hit = simulateHit(sdof, opts, createRng(3));
    const t0 = opts.preTriggerS;
    const T = opts.samples / opts.fs;
    const tau = -(T - t0) / Math.log(0.01); // window falls to 1 % at the record end (docs/methods.md#exp-window)
    const w = (n: number) => (n / opts.fs < t0 ? 1 : Math.exp(-(n / opts.fs - t0) / tau));
    const fw = hit.force.map((v, n) => v * w(n));
    const aw = hit.responses[0].map((v, n) => v * w(n));
    for (const fk of [60, 90, 100, 110, 140]) {
      const h = cdiv(dtft(aw, opts.fs, fk), dtft(fw, opts.fs, fk));
      // A(s) = s²/(s² + 2ζω_n s + ω_n²) evaluated at s = jω + 1/τ (docs/methods.md#exp-window, #modal-model with φ = 1)
      const sRe = 1 / tau;
      const sIm = 2 * Math.PI * fk;
      const wn = 2 * Math.PI * 100;
      const s2 = { re: sRe * sRe - sIm * sIm, im: 2 * sRe * sIm };
      const den = { re: s2.re + 2 * 0.02 * wn * sRe + wn * wn, im: s2.im + 2 * 0.02 * wn * sIm };
      const ref = cdiv(s2, den);
      expect(Math.abs(cabs(h) / cabs(ref) - 1)).toBeLessThan(0.01);
      expect(Math.abs(phaseDiffDeg(h, ref))).toBeLessThan(1);
    }
  });

  it('matches the closed-form accelerance of the steel bar near each of its Z resonances', () => {
    const bar = steelBar();
    const opts: HitOptions = {
      ...base,
      excitationDof: 'B01:+Z',
      responseDofs: ['B01:+Z', 'B21:+Z', 'B06:-Z'],
      fs: 4096,
      samples: 32768, // 8 s ≈ 11 time constants of the 53 Hz mode at ζ = 0.42 % (τ = 1/(ζω) = 0.71 s)
      pulseWidthS: 0.5e-3,
    };
    const hit = simulateHit(bar.model, opts, createRng(5));
    const zModes = bar.model.modes.filter((m) => 'B01:+Z' in m.shape && m.fnHz > 10).map((m) => m.fnHz); // bending modes
    for (const fn of zModes.slice(0, 4)) {
      for (const fk of [0.97 * fn, 0.995 * fn, fn, 1.005 * fn, 1.03 * fn]) {
        const F = dtft(hit.force, opts.fs, fk);
        opts.responseDofs.forEach((dof, c) => {
          const h = cdiv(dtft(hit.responses[c], opts.fs, fk), F);
          const ex = modelFrf(bar.model, dof, 'B01:+Z', [fk], 'accelerance');
          const ref = { re: ex.re[0], im: ex.im[0] };
          expect(Math.abs(cabs(h) / cabs(ref) - 1)).toBeLessThan(0.01);
          expect(Math.abs(phaseDiffDeg(h, ref))).toBeLessThan(1);
        });
      }
    }
  });

  it('needs the anti-alias stage: without it, a 1 ms pulse at 2048 Hz aliases and biases the FRF by > 1 %', () => {
    const opts: HitOptions = { ...base, fs: 2048, samples: 4096 };
    const exact = modelFrf(sdof, '1:+Z', '1:+Z', [60], 'accelerance');
    const ref = { re: exact.re[0], im: exact.im[0] };
    const ratio = (hit: ReturnType<typeof simulateHit>) =>
      cabs(cdiv(dtft(hit.truth.cleanResponses[0], opts.fs, 60), dtft(hit.truth.cleanForce, opts.fs, 60))) / cabs(ref);
    // Force content above fs/2 folds back (docs/methods.md#transient-spectrum: valid only if fs exceeds twice the content).
    expect(Math.abs(ratio(simulateHit(sdof, { ...opts, antiAlias: false }, createRng(1))) - 1)).toBeGreaterThan(0.01);
    expect(Math.abs(ratio(simulateHit(sdof, opts, createRng(1))) - 1)).toBeLessThan(1e-3);
  });

  it('matches an RK4 integration of the physical 2-DOF chain of docs/methods.md#chain-2dof (M, C, K, not modes)', () => {
    const w1 = Math.sqrt(1000);
    const w2 = Math.sqrt(3000);
    // Rayleigh C = aM + bK giving ζ = 2 % in both modes (docs/methods.md#chain-2dof: a = 0.801921 s⁻¹, b = 4.62990e-4 s).
    const b = (2 * 0.02) / (w1 + w2);
    const a = (2 * 0.02 * w1 * w2) / (w1 + w2);
    expect(Math.abs(a - 0.801921)).toBeLessThan(1e-6);
    expect(Math.abs(b - 4.6299e-4)).toBeLessThan(1e-9);
    const K = [
      [2000, -1000],
      [-1000, 2000],
    ];
    const C = K.map((row, i) => row.map((kij, j) => b * kij + (i === j ? a : 0)));
    const s = Math.SQRT1_2;
    const chain: ModalModel = {
      modes: [
        { fnHz: w1 / (2 * Math.PI), zeta: 0.02, shape: { 'm1:+X': s, 'm2:+X': s } },
        { fnHz: w2 / (2 * Math.PI), zeta: 0.02, shape: { 'm1:+X': s, 'm2:+X': -s } },
      ],
    };
    const opts: HitOptions = {
      ...base,
      excitationDof: 'm1:+X',
      responseDofs: ['m1:+X', 'm2:+X'],
      fs: 1000,
      samples: 2000,
      preTriggerS: 0.02,
      pulseWidthS: 0.01,
      forceRangeN: 1000,
      responseRangeMs2: 1000,
      antiAlias: false, // compare the exact samples of the continuous response
    };
    const hit = simulateHit(chain, opts, createRng(9));
    const pulse = hit.truth.pulses;
    const h = 1e-5; // pulse edges at 20 ms and 30 ms fall on steps
    const every = 100;
    const rk = rk4Accelerations([[1, 0], [0, 1]], C, K, [1, 0], (t) => halfSineAt(t, pulse), h, (opts.samples - 1) * every, every);
    for (let c = 0; c < 2; c++) {
      const clean = hit.truth.cleanResponses[c];
      const peak = Math.max(...clean.map(Math.abs));
      for (let n = 0; n < opts.samples; n++) expect(Math.abs(clean[n] - rk[c][n])).toBeLessThan(1e-8 * peak);
    }
  });
});

describe('simulateHit: force pulse, double hit, converter', () => {
  it('puts the half-sine at the end of the pre-trigger with peak A and impulse 2AT/π (docs/methods.md#pulse-spectra)', () => {
    const hit = simulateHit(sdof, { ...base, fs: 10000, samples: 2000, preTriggerS: 0.01, antiAlias: false }, createRng(1));
    const f = hit.truth.cleanForce;
    expect(f[100]).toBe(0); // t₀ = 10 ms
    expect(f[105]).toBeCloseTo(100, 10); // crest at t₀ + T/2
    expect(hit.truth.impulseNs).toBeCloseTo((2 * 100 * 1e-3) / Math.PI, 15);
    expect(hit.truth.doubleHit).toBe(false);
    // The digitised force differs from the clean one by at most half a quantisation step.
    for (let n = 0; n < f.length; n++) expect(Math.abs(hit.force[n] - f[n])).toBeLessThanOrEqual(hit.truth.quantStepForceN / 2 + 1e-12);
  });

  it('adds a second pulse at the requested delay and ratio for a double hit', () => {
    const hit = simulateHit(sdof, { ...base, fs: 10000, samples: 2000, doubleHit: { delayS: 0.004, ratio: 0.3 }, antiAlias: false }, createRng(1));
    const f = hit.truth.cleanForce;
    expect(hit.truth.doubleHit).toBe(true);
    expect(hit.truth.pulses[1]).toEqual({ startS: 0.014, amplitudeN: 30, widthS: 1e-3 });
    expect(f[145]).toBeCloseTo(30, 9); // second crest at 10 + 4 + 0.5 ms
    expect(f[130]).toBe(0); // quiet between the contacts
    expect(hit.truth.impulseNs).toBeCloseTo((1.3 * 2 * 100 * 1e-3) / Math.PI, 15);
  });

  it('clips at ±range, never exceeds it, and sets the overload flag of that channel only', () => {
    const hit = simulateHit(
      sdof,
      { ...base, peakForceN: 300, forceRangeN: 200, responseDofs: ['1:+Z', '2:+Z'], responseRangeMs2: [20, 5000] },
      createRng(1),
    );
    expect(hit.overload.force).toBe(true);
    expect(hit.overload.responses).toEqual([true, false]);
    expect(hit.force.reduce((m, v) => Math.max(m, Math.abs(v)), 0)).toBeLessThanOrEqual(200);
    expect(hit.responses[0].reduce((m, v) => Math.max(m, Math.abs(v)), 0)).toBeLessThanOrEqual(20);
    // A run of equal samples at the top of the range, as the digital check of docs/methods.md#overload expects.
    const max = hit.force.reduce((m, v) => Math.max(m, v), -Infinity);
    const top = hit.force.filter((v) => v === max).length;
    expect(top).toBeGreaterThanOrEqual(3);
    const fine = simulateHit(sdof, base, createRng(1));
    expect(fine.overload).toEqual({ force: false, responses: [false] });
  });

  it('quantises with the step 2·range/2^bits', () => {
    const bits = 12;
    const hit = simulateHit(sdof, { ...base, adcBits: bits, forceNoiseN: 0.3, responseNoise: 0.1 }, createRng(4));
    const q = (2 * base.forceRangeN) / 2 ** bits; // 0.244140625 N
    expect(hit.truth.quantStepForceN).toBe(q);
    const levels = new Set<number>();
    for (const v of hit.force) {
      const code = v / q;
      expect(Math.abs(code - Math.round(code))).toBeLessThan(1e-9);
      levels.add(Math.round(code));
    }
    // Noise of 0.3 N rms spans several neighbouring codes around zero, one step apart.
    expect(levels.has(1) && levels.has(-1) && levels.has(0)).toBe(true);
    const qr = (2 * 5000) / 2 ** bits;
    for (const v of hit.responses[0]) expect(Math.abs(v / qr - Math.round(v / qr))).toBeLessThan(1e-9);
  });

  it('adds noise of the requested rms and DC offsets that show in the pre-trigger', () => {
    const hit = simulateHit(
      sdof,
      { ...base, forceNoiseN: 0.5, responseNoise: 0.02, dcOffset: { forceN: 2, responseMs2: -0.1 }, preTriggerS: 1.0, samples: 16384 },
      createRng(11),
    );
    const pre = 8192; // samples before t₀ = 1 s
    const stats = (x: Float64Array) => {
      let s = 0;
      let s2 = 0;
      for (let n = 0; n < pre; n++) {
        s += x[n];
        s2 += x[n] * x[n];
      }
      const mean = s / pre;
      return { mean, rms: Math.sqrt(s2 / pre - mean * mean) };
    };
    // Standard error of an rms estimate from N gaussian samples ≈ σ/√(2N) = 0.8 %; of a mean σ/√N.
    const fs = stats(hit.force);
    expect(Math.abs(fs.mean - 2)).toBeLessThan(0.03);
    expect(Math.abs(fs.rms / 0.5 - 1)).toBeLessThan(0.05);
    const rs = stats(hit.responses[0]);
    expect(Math.abs(rs.mean + 0.1)).toBeLessThan(0.002);
    expect(Math.abs(rs.rms / 0.02 - 1)).toBeLessThan(0.05);
  });

  it('reproduces a record exactly from the same seed and changes the noise with the seed', () => {
    const opts = { ...base, forceNoiseN: 0.2, responseNoise: 0.05 };
    const a = simulateHit(sdof, opts, createRng(77));
    const b = simulateHit(sdof, opts, createRng(77));
    const c = simulateHit(sdof, opts, createRng(78));
    expect(Array.from(a.force)).toEqual(Array.from(b.force));
    expect(Array.from(a.responses[0])).toEqual(Array.from(b.responses[0]));
    let differ = 0;
    for (let n = 0; n < a.force.length; n++) if (a.force[n] !== c.force[n]) differ++;
    expect(differ).toBeGreaterThan(a.force.length / 2);
    expect(Array.from(a.truth.cleanResponses[0])).toEqual(Array.from(c.truth.cleanResponses[0]));
  });
});

describe('simulateHit: argument checks', () => {
  const rng = createRng(1);
  const cases: [string, Partial<HitOptions>, RegExp][] = [
    ['fs = 0', { fs: 0 }, /fs=0 must be > 0/],
    ['fs < 0', { fs: -100 }, /fs=-100/],
    ['samples < 2', { samples: 1 }, /samples=1/],
    ['NaN peak force', { peakForceN: Number.NaN }, /peakForceN=NaN/],
    ['NaN pre-trigger', { preTriggerS: Number.NaN }, /preTriggerS=NaN/],
    ['negative noise', { forceNoiseN: -1 }, /forceNoiseN=-1/],
    ['zero range', { forceRangeN: 0 }, /forceRangeN=0/],
    ['1-bit converter', { adcBits: 1 }, /adcBits=1/],
    ['unknown excitation DOF', { excitationDof: '9:+Z' }, /9:\+Z/],
    ['unknown response DOF', { responseDofs: ['1:+Z', 'nowhere:+X'] }, /nowhere:\+X/],
    ['malformed DOF', { excitationDof: '1-Z' }, /dof="1-Z"/],
    ['pulse longer than the record', { samples: 64, fs: 8192, preTriggerS: 0.007 }, /pulseWidthS=0.001/],
    ['double hit past the record end', { samples: 200, fs: 8192, doubleHit: { delayS: 0.02, ratio: 0.5 } }, /double hit/],
    ['double hit overlapping the first contact', { doubleHit: { delayS: 0.0005, ratio: 0.5 } }, /doubleHit.delayS=0.0005/],
    ['range list of the wrong length', { responseRangeMs2: [10, 20] }, /responseRangeMs2 has 2 entries/],
  ];
  for (const [what, change, message] of cases) {
    it(`rejects ${what} with a RangeError naming the value`, () => {
      expect(() => simulateHit(sdof, { ...base, ...change }, rng)).toThrow(RangeError);
      expect(() => simulateHit(sdof, { ...base, ...change }, rng)).toThrow(message);
    });
  }
});

describe('hitSeries', () => {
  const opts: HitOptions = { ...base, samples: 4096, forceNoiseN: 0.1, responseNoise: 0.01 };

  it('varies peak force and contact time from hit to hit with the requested spreads', () => {
    const hits = hitSeries(sdof, { ...opts, samples: 256, preTriggerS: 0.005 }, 400, createRng(3), { peakSpread: 0.2, widthSpread: 0.1 });
    expect(hits).toHaveLength(400);
    const logs = (xs: number[]) => {
      const l = xs.map(Math.log);
      const m = l.reduce((s, v) => s + v, 0) / l.length;
      return { mean: m, sd: Math.sqrt(l.reduce((s, v) => s + (v - m) ** 2, 0) / (l.length - 1)) };
    };
    const peaks = logs(hits.map((h) => h.truth.pulses[0].amplitudeN));
    const widths = logs(hits.map((h) => h.truth.pulses[0].widthS));
    // Log-normal: log A ~ N(log 100, 0.2²). Standard error of the sd from 400 draws ≈ sd/√800 = 3.5 %.
    expect(Math.abs(peaks.sd / 0.2 - 1)).toBeLessThan(0.15);
    expect(Math.abs(peaks.mean - Math.log(100))).toBeLessThan(0.05);
    expect(Math.abs(widths.sd / 0.1 - 1)).toBeLessThan(0.15);
    expect(Math.abs(widths.mean - Math.log(1e-3))).toBeLessThan(0.03);
  });

  it('adds double hits and overloads with the requested probabilities', () => {
    const always = hitSeries(sdof, opts, 5, createRng(8), { doubleHitProbability: 1, overloadProbability: 1 });
    for (const h of always) {
      expect(h.truth.doubleHit).toBe(true);
      const [first, second] = h.truth.pulses;
      expect(second.startS - first.startS).toBeGreaterThanOrEqual(2 * first.widthS - 1e-15);
      expect(second.amplitudeN / first.amplitudeN).toBeGreaterThanOrEqual(0.15);
      expect(second.amplitudeN / first.amplitudeN).toBeLessThanOrEqual(0.6);
      expect(h.overload.force).toBe(true);
    }
    const never = hitSeries(sdof, opts, 5, createRng(8));
    for (const h of never) {
      expect(h.truth.doubleHit).toBe(false);
      expect(h.overload.force).toBe(false);
    }
    const some = hitSeries(sdof, { ...opts, samples: 256, preTriggerS: 0.005 }, 300, createRng(8), { doubleHitProbability: 0.2 });
    const count = some.filter((h) => h.truth.doubleHit).length;
    // Binomial(300, 0.2): mean 60, sd 6.9
    expect(count).toBeGreaterThan(35);
    expect(count).toBeLessThan(85);
  });

  it('reproduces the whole series from the seed', () => {
    const a = hitSeries(sdof, opts, 3, createRng(21), { doubleHitProbability: 0.5 });
    const b = hitSeries(sdof, opts, 3, createRng(21), { doubleHitProbability: 0.5 });
    a.forEach((h, i) => {
      expect(h.truth.pulses).toEqual(b[i].truth.pulses);
      expect(Array.from(h.responses[0])).toEqual(Array.from(b[i].responses[0]));
    });
  });

  it('rejects probabilities outside [0, 1] and a zero count', () => {
    expect(() => hitSeries(sdof, opts, 3, createRng(1), { doubleHitProbability: 1.5 })).toThrow(/doubleHitProbability=1.5/);
    expect(() => hitSeries(sdof, opts, 0, createRng(1))).toThrow(/count=0/);
  });
});
