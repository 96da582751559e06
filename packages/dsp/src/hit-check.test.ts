import { describe, expect, it } from 'vitest';
import { add, gaussian, halfSine, noise } from '../test/helpers.ts';
import { checkHit, defaultHitLimits } from './hit-check.ts';
import { transientSpectrum } from './spectra.ts';

const fs = 51200;
const n = 8192; // 0.16 s
const t0 = 5e-3; // pulse starts after 5 ms of pre-trigger

function quietResponse(): Float64Array {
  // a decaying 80 Hz ring that has died away well before the record ends
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / fs - t0;
    if (t > 0) x[i] = Math.exp(-t / 0.01) * Math.sin(2 * Math.PI * 80 * t);
  }
  return x;
}

describe('checkHit double-hit detection (docs/methods.md#double-hit)', () => {
  const delaysMs = [1, 2, 3, 5, 8, 12, 20];
  const ratios = [0.05, 0.1, 0.2, 0.4, 0.8];
  const widthsMs = [0.5, 1];
  let seed = 100;
  for (const w of widthsMs) {
    for (const d of delaysMs) {
      for (const r of ratios) {
        const s = seed++;
        it(`rejects a ${w} ms hit followed ${d} ms later by a second impact at ${r * 100} % of its peak, with noise`, () => {
          const first = halfSine(n, fs, 100, w * 1e-3, t0);
          const second = halfSine(n, fs, 100 * r, w * 1e-3, t0 + d * 1e-3);
          // noise 0.2 N rms on a 100 N hit (0.2 %), seeded
          const force = add(first, second, noise(n, 0.2, gaussian(s)));
          const res = checkHit(force, [quietResponse()], fs, { bandHz: [0, 200] });
          const codes = res.reasons.map((x) => x.code);
          expect(codes).toContain('double-hit');
          expect(res.verdict).toBe('reject');
          // construction: peaks are d ms apart at ratio r; noise moves the flat top of a small
          // second pulse by up to ~0.1 ms and its height by < 1 % of the first
          expect(Math.abs(res.secondPeakDelayS! * 1000 - d)).toBeLessThan(0.15);
          expect(Math.abs(res.secondPeakRatio! - r)).toBeLessThan(0.012);
        });
      }
    }
  }

  it('writes the reason in plain words with the delay and the ratio', () => {
    const force = add(halfSine(n, fs, 100, 1e-3, t0), halfSine(n, fs, 38, 1e-3, t0 + 4.1e-3));
    const res = checkHit(force, [quietResponse()], fs, { bandHz: [0, 200] });
    // construction: second pulse 4.1 ms later at 38 %
    expect(res.reasons).toEqual([{ code: 'double-hit', message: 'second impact 4.1 ms after the first, 38 % of its peak' }]);
  });

  it('never flags clean hits of 0.2 to 5 ms and 5 to 2000 N as double hits', () => {
    let s = 900;
    for (const w of [0.2, 0.35, 0.5, 1, 2, 3.5, 5]) {
      for (const a of [5, 50, 500, 2000]) {
        for (const shape of ['half-sine', 'squared-sine'] as const) {
          const pulse = halfSine(n, fs, 1, w * 1e-3, t0).map((v) => a * (shape === 'half-sine' ? v : v * v));
          const force = add(pulse, noise(n, 0.002 * a, gaussian(s++)));
          const res = checkHit(force, [quietResponse()], fs, { bandHz: [0, 100] });
          // construction: one pulse only
          expect(res.reasons.map((x) => `${w} ms ${a} N ${shape}: ${x.code}`)).toEqual([]);
          expect(res.verdict).toBe('accept');
          expect(res.secondPeakRatio).toBeNull();
        }
      }
    }
  });

  it('measures a half-sine pulse: peak, width at 5 % of peak, impulse 2AT/π', () => {
    const res = checkHit(halfSine(n, fs, 100, 1e-3, t0), [quietResponse()], fs, { bandHz: [0, 500] });
    // closed form: A·sin(πt/T) crosses 5 % at t = T·asin(0.05)/π, so the width is T(1 − 2·asin(0.05)/π)
    expect(res.pulseWidthS! / (1e-3 * (1 - (2 * Math.asin(0.05)) / Math.PI))).toBeCloseTo(1, 3);
    expect(res.peakForceN).toBeCloseTo(100, 1);
    // docs/methods.md#pulse-spectra: X(0) = 2AT/π = 0.0636620 N·s (sampled: within 0.05 %)
    expect(res.impulseNs / 0.063662 - 1).toBeLessThan(5e-4);
    expect(res.pulseStartS).toBeCloseTo(t0, 4);
  });

  it('shows the spectral signature of a double hit: notches at 100, 300, 500 Hz and twice the single hit at 200 Hz', () => {
    const one = halfSine(n, fs, 100, 1e-3, 0);
    const two = add(one, halfSine(n, fs, 100, 1e-3, 5e-3));
    const X1 = transientSpectrum(one, fs);
    const X2 = transientSpectrum(two, fs);
    const mag = (X: { re: Float64Array; im: Float64Array }, hz: number) => Math.hypot(X.re[hz / 6.25], X.im[hz / 6.25]);
    // docs/methods.md#double-hit [calc]: 0 at 100, 300 and 500 Hz
    for (const hz of [100, 300, 500]) expect(mag(X2, hz)).toBeLessThan(1e-15);
    // docs/methods.md#double-hit [calc]: single hit 0.061305 N·s at 200 Hz, the double hit exactly twice (0.12261)
    expect(mag(X1, 200)).toBeCloseTo(0.061305, 6);
    expect(mag(X2, 200) / mag(X1, 200)).toBeCloseTo(2, 12);
    expect(mag(X2, 200)).toBeCloseTo(0.12261, 5);
  });
});

describe('checkHit overload, weak hit, roll-off and responses', () => {
  it('flags a clipped force as overload with the count and the range', () => {
    const force = halfSine(n, fs, 600, 1e-3, t0).map((v) => Math.min(v, 500));
    const res = checkHit(force, [quietResponse()], fs, { forceRangeN: 500, bandHz: [0, 200] });
    const over = res.reasons.find((r) => r.code === 'overload');
    // construction: samples of 600·sin ≥ 495 N
    let expected = 0;
    for (const v of force) if (v >= 495) expected++;
    expect(over?.message).toBe(`force channel clipped: ${expected} samples at 99 % or more of the 500 N range: use a higher range or hit softer`);
    expect(res.forceClippedSamples).toBe(expected);
  });

  it('flags a flat top of three or more equal samples when the range is unknown', () => {
    const force = halfSine(n, fs, 130, 1e-3, t0).map((v) => Math.min(v, 100));
    const res = checkHit(force, [quietResponse()], fs, { bandHz: [0, 200] });
    // common practice (docs/methods.md#overload): runs of ≥ 3 equal samples at an extreme
    expect(res.reasons.map((r) => r.code)).toContain('overload');
    expect(res.forceFlatRun).toBeGreaterThanOrEqual(3);
    expect(res.reasons.find((r) => r.code === 'overload')?.message).toMatch(/equal samples in a row at 100 N/);
  });

  it('rejects a weak hit below minPeakN and a record with no hit at all', () => {
    const weak = add(halfSine(n, fs, 3, 1e-3, t0), noise(n, 0.01, gaussian(5)));
    const res = checkHit(weak, [quietResponse()], fs, { minPeakN: 10, bandHz: [0, 200] });
    expect(res.reasons.map((r) => r.code)).toEqual(['weak']);
    expect(res.reasons[0].message).toMatch(/^weak hit: peak force 3(\.\d+)? N is below the 10 N minimum: hit harder$/);
    const none = checkHit(noise(n, 0.05, gaussian(6)), [quietResponse()], fs);
    expect(none.reasons.map((r) => r.code)).toEqual(['weak']);
    expect(none.reasons[0].message).toMatch(/^no impact found/);
  });

  it('finds the −10 and −20 dB frequencies of a 1 ms half-sine and rejects it for a 2 kHz band', () => {
    const res = checkHit(halfSine(n, fs, 100, 1e-3, t0), [quietResponse()], fs, { bandHz: [0, 2000] });
    // docs/methods.md#pulse-spectra [calc]: −10 dB at 1.019/T, −20 dB at 1.303/T (interpolated on 6.25 Hz lines)
    expect(res.rollOff10dBHz! / 1019 - 1).toBeLessThan(0.01);
    expect(Math.abs(res.rollOff20dBHz! / 1303 - 1)).toBeLessThan(0.01);
    expect(res.reasons).toHaveLength(1);
    expect(res.reasons[0].code).toBe('roll-off');
    expect(res.reasons[0].message).toMatch(/^force spectrum falls 20 dB by 13\d\d Hz, inside the 0–2000 Hz band: use a harder tip$/);
    // docs/methods.md#roll-off [calc]: T_c = 0.5 ms gives −10 dB at 2.04 kHz and −20 dB at 2.61 kHz
    const soft = checkHit(halfSine(n, fs, 100, 0.5e-3, t0), [quietResponse()], fs, { bandHz: [0, 2000] });
    expect(Math.abs(soft.rollOff10dBHz! / 2040 - 1)).toBeLessThan(0.01);
    expect(Math.abs(soft.rollOff20dBHz! / 2610 - 1)).toBeLessThan(0.01);
    expect(soft.verdict).toBe('accept');
  });

  it('uses 0 … fs/2.56 as the band and 20 dB as the limit by default', () => {
    // common practice docs/methods.md#decay-check: f_max = fs/2.56; docs/methods.md#roll-off: 10–20 dB
    expect(defaultHitLimits.rollOffDb).toBe(20);
    const res = checkHit(halfSine(n, fs, 100, 0.1e-3, t0), [quietResponse()], fs);
    // docs/methods.md#pulse-spectra: a 0.1 ms half-sine is 20 dB down at 1.303/T = 13 kHz, inside 0–20 kHz
    expect(res.reasons.map((r) => r.code)).toEqual(['roll-off']);
    expect(res.reasons[0].message).toContain('inside the 0–20000 Hz band');
  });

  it('flags a clipped response channel and one that has not died away, naming the channel', () => {
    const force = halfSine(n, fs, 100, 1e-3, t0);
    const clipped = quietResponse().map((v) => Math.max(-0.5, Math.min(0.5, v)));
    const ringing = new Float64Array(n);
    for (let i = 0; i < n; i++) ringing[i] = Math.exp(-i / fs / 0.2) * Math.sin((2 * Math.PI * 60 * i) / fs);
    const res = checkHit(force, [clipped, ringing], fs, { responseRange: [0.5, 10], bandHz: [0, 200] });
    expect(res.reasons.map((r) => r.code)).toEqual(['response-overload', 'not-decayed']);
    expect(res.reasons[0].message).toMatch(/^response 1 clipped: \d+ samples at 99 % or more of its 0.5 range/);
    // closed form: envelope e^{−t/0.2} is e^{−0.8} ≈ 45 % at the end of 0.16 s; tail rms ≈ 0.45/√2·(…) ≈ 30 %
    expect(res.responses[1].tailRatio).toBeGreaterThan(0.25);
    expect(res.reasons[1].message).toMatch(/^response 2 has not died away: the last 5 % of the record is at \d+ % of its peak \(limit 1 %\): use a longer record or an exponential window$/);
    // with an exponential window of τ = 10 ms the tail is e^{−15} of the start: decayed
    const windowed = checkHit(force, [ringing], fs, { bandHz: [0, 200], exponentialWindow: { startS: t0, tauS: 0.01 } });
    expect(windowed.verdict).toBe('accept');
  });

  it('rejects limits that make no sense, naming them', () => {
    const force = halfSine(n, fs, 100, 1e-3, t0);
    expect(() => checkHit(force, [], fs, { doubleHitRatio: 0 })).toThrow(/doubleHitRatio=0/);
    expect(() => checkHit(force, [], fs, { forceRangeN: -5 })).toThrow(/forceRangeN=-5/);
    expect(() => checkHit(force, [quietResponse()], fs, { responseRange: [1, 2] })).toThrow(/responseRange has 2 entries/);
    expect(() => checkHit(force, [], fs, { bandHz: [100, 50] })).toThrow(RangeError);
  });
});
