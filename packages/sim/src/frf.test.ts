import { describe, expect, it } from 'vitest';
import { modelFrf } from './frf.ts';
import type { ModalModel } from './modal-model.ts';
import { steelBar } from './steel-bar.ts';

// SDOF of docs/methods.md#frf-kinds: m = 1 kg, f_n = 100 Hz, ζ = 0.02. A mass-normalised mode of a
// 1 kg mass has φ = 1/√m = 1.
const sdof: ModalModel = { modes: [{ fnHz: 100, zeta: 0.02, shape: { '1:+Z': 1 } }] };

// 2-DOF chain of docs/methods.md#chain-2dof: f = 5.03292 and 8.71728 Hz (ω² = 1000 and 3000 exactly),
// modes (1/√2)[1, 1] and (1/√2)[1, −1], ζ = 2 % in both.
const s = Math.SQRT1_2;
const f1 = Math.sqrt(1000) / (2 * Math.PI);
const f2 = Math.sqrt(3000) / (2 * Math.PI);
const twoDof: ModalModel = {
  modes: [
    { fnHz: f1, zeta: 0.02, shape: { '1:+X': s, '2:+X': s } },
    { fnHz: f2, zeta: 0.02, shape: { '1:+X': s, '2:+X': -s } },
  ],
};

const at = (m: ModalModel, j: string, k: string, f: number, kind: 'receptance' | 'mobility' | 'accelerance') => {
  const r = modelFrf(m, j, k, [f], kind);
  return { re: r.re[0], im: r.im[0] };
};

/** |a − b| ≤ rel·|b| + abs */
const close = (a: number, b: number, rel: number, abs = 0) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b) + abs);

describe('modelFrf on the SDOF of docs/methods.md#frf-kinds', () => {
  it('gives α(0) = 1/k = 2.53303e-6 m/N', () => {
    const a = at(sdof, '1:+Z', '1:+Z', 0, 'receptance');
    close(a.re, 2.53303e-6, 2e-6); // docs/methods.md#frf-kinds check value
    expect(a.im).toBe(0);
  });

  it('gives α(ω_n) = −6.33257e-5·j m/N', () => {
    const a = at(sdof, '1:+Z', '1:+Z', 100, 'receptance');
    close(a.im, -6.33257e-5, 2e-6); // docs/methods.md#frf-kinds check value
    expect(Math.abs(a.re)).toBeLessThan(1e-18);
  });

  it('gives Y(ω_n) = 1/c = 0.0397887 (m/s)/N, real', () => {
    const y = at(sdof, '1:+Z', '1:+Z', 100, 'mobility');
    close(y.re, 0.0397887, 2e-6); // docs/methods.md#frf-kinds check value
    expect(Math.abs(y.im)).toBeLessThan(1e-15);
  });

  it('gives A(ω_n) = 25.000·j (m/s²)/N', () => {
    const a = at(sdof, '1:+Z', '1:+Z', 100, 'accelerance');
    close(a.im, 25.0, 1e-12); // docs/methods.md#frf-kinds: A(ω_n) = j/(2ζm) = 25 j
    expect(Math.abs(a.re)).toBeLessThan(1e-12);
  });

  it('matches numpy off resonance at 50 and 150 Hz in all three forms', () => {
    // reference/sim_reference.py (numpy): 1/(k − mω² + jcω) and its jω and −ω² multiples.
    const expected = {
      50: {
        receptance: [3.3749728074148746e-6, -8.999927486439664e-8],
        mobility: [2.8274106074239704e-5, 0.001060278977783989],
        accelerance: [-0.33309646473618754, 0.008882572392965],
      },
      150: {
        receptance: [-2.021765525076979e-6, -9.7044745203695e-8],
        mobility: [9.146251758042645e-5, -0.0019054691162588842],
        accelerance: [1.7958623331843437, 0.0862013919928485],
      },
    } as const;
    for (const f of [50, 150] as const) {
      for (const kind of ['receptance', 'mobility', 'accelerance'] as const) {
        const h = at(sdof, '1:+Z', '1:+Z', f, kind);
        const [re, im] = expected[f][kind];
        const mag = Math.hypot(re, im);
        close(h.re, re, 0, 1e-12 * mag);
        close(h.im, im, 0, 1e-12 * mag);
      }
    }
  });

  it('tends to the mass line 1/m far above resonance', () => {
    const a = at(sdof, '1:+Z', '1:+Z', 1e6, 'accelerance');
    close(a.re, 1, 1e-7); // docs/methods.md#frf-kinds: A(ω → ∞) → 1/m
  });

  it('keeps the phase conventions of docs/methods.md#conventions: mobility leads receptance by 90°, accelerance by 180°', () => {
    for (const f of [30, 99, 140, 400]) {
      const rc = at(sdof, '1:+Z', '1:+Z', f, 'receptance');
      const mb = at(sdof, '1:+Z', '1:+Z', f, 'mobility');
      const ac = at(sdof, '1:+Z', '1:+Z', f, 'accelerance');
      const ph = (z: { re: number; im: number }) => Math.atan2(z.im, z.re);
      const wrap = (x: number) => Math.atan2(Math.sin(x), Math.cos(x));
      expect(ph(rc)).toBeLessThanOrEqual(0); // passive receptance: phase in [−180°, 0°]
      close(wrap(ph(mb) - ph(rc)), Math.PI / 2, 1e-12);
      close(Math.abs(wrap(ph(ac) - ph(rc))), Math.PI, 1e-12);
    }
  });
});

describe('modelFrf on the 2-DOF chain of docs/methods.md#chain-2dof', () => {
  it('gives α11(6 Hz) = −8.56163e-4 − 1.49203e-4·j m/N', () => {
    const a = at(twoDof, '1:+X', '1:+X', 6, 'receptance');
    close(a.re, -8.56163e-4, 1e-6); // docs/methods.md#chain-2dof damped value (6 significant digits)
    close(a.im, -1.49203e-4, 1e-5);
  });

  it('gives α12(6 Hz) = −1.48784e-3 − 1.16157e-4·j m/N', () => {
    const a = at(twoDof, '1:+X', '2:+X', 6, 'receptance');
    close(a.re, -1.48784e-3, 1e-5); // docs/methods.md#chain-2dof
    close(a.im, -1.16157e-4, 1e-5);
  });

  it('gives α11(ω1), α11(ω2) and α12(ω2), the last with the reversed imaginary sign', () => {
    const a11w1 = at(twoDof, '1:+X', '1:+X', f1, 'receptance');
    close(a11w1.re, 2.497e-4, 1e-4); // docs/methods.md#chain-2dof: 2.49700e-4 − 1.250865e-2 j
    close(a11w1.im, -1.250865e-2, 1e-6);
    const a11w2 = at(twoDof, '1:+X', '1:+X', f2, 'receptance');
    close(a11w2.re, -2.497e-4, 1e-4); // docs/methods.md#chain-2dof: −2.49700e-4 − 4.17532e-3 j
    close(a11w2.im, -4.17532e-3, 1e-5);
    const a12w2 = at(twoDof, '1:+X', '2:+X', f2, 'receptance');
    close(a12w2.re, -2.497e-4, 1e-4); // docs/methods.md#chain-2dof: −2.49700e-4 + 4.15802e-3 j
    close(a12w2.im, 4.15802e-3, 1e-5);
  });

  it('matches the direct inverse of (K − ω²M + jωC) computed with numpy at 2 and 12 Hz', () => {
    // reference/sim_reference.py: Rayleigh C = aM + bK with ζ = 2 % in both modes, numpy.linalg.inv.
    const ref = {
      2: { a11: [0.0007694624527623615, -1.2908030561477535e-5], a12: [0.0004176412717041213, -9.499908039712978e-6] },
      12: { a11: [-0.00029220676955732817, -1.358626840784821e-5], a12: [7.88431059642927e-5, 9.242746968971881e-6] },
    } as const;
    for (const f of [2, 12] as const) {
      const a11 = at(twoDof, '1:+X', '1:+X', f, 'receptance');
      const a12 = at(twoDof, '1:+X', '2:+X', f, 'receptance');
      close(a11.re, ref[f].a11[0], 1e-10);
      close(a11.im, ref[f].a11[1], 1e-9);
      close(a12.re, ref[f].a12[0], 1e-10);
      close(a12.im, ref[f].a12[1], 1e-9);
    }
  });

  it('keeps the driving-point phase between −180° and 0° from 0.016 to 32 Hz (docs/methods.md#chain-2dof)', () => {
    const f = Array.from({ length: 2000 }, (_, i) => 0.016 * Math.pow(2000, i / 1999));
    const { re, im } = modelFrf(twoDof, '1:+X', '1:+X', f, 'receptance');
    for (let i = 0; i < f.length; i++) {
      const deg = (Math.atan2(im[i], re[i]) * 180) / Math.PI;
      expect(deg).toBeLessThan(0);
      expect(deg).toBeGreaterThan(-180);
    }
  });

  it('is reciprocal: H12 = H21 (docs/methods.md#modal-model)', () => {
    const f = [1, 5, 7.1, 9, 20];
    const h12 = modelFrf(twoDof, '1:+X', '2:+X', f, 'accelerance');
    const h21 = modelFrf(twoDof, '2:+X', '1:+X', f, 'accelerance');
    expect(Array.from(h12.re)).toEqual(Array.from(h21.re));
    expect(Array.from(h12.im)).toEqual(Array.from(h21.im));
  });

  it('changes sign when either DOF is given in its negative direction (docs/methods.md#dof-signs)', () => {
    const f = [3, 6, 11];
    const pos = modelFrf(twoDof, '1:+X', '2:+X', f, 'mobility');
    const negExc = modelFrf(twoDof, '1:+X', '2:-X', f, 'mobility');
    const negBoth = modelFrf(twoDof, '1:-X', '2:-X', f, 'mobility');
    for (let i = 0; i < f.length; i++) {
      expect(negExc.re[i]).toBe(-pos.re[i]);
      expect(negExc.im[i]).toBe(-pos.im[i]);
      expect(negBoth.re[i]).toBe(pos.re[i]);
    }
  });
});

describe('modelFrf on the steel bar', () => {
  const bar = steelBar();
  it('has a driving point with Re(mobility) ≥ 0 everywhere and Im(accelerance) > 0 at every resonance (docs/methods.md#modal-model)', () => {
    const f = Array.from({ length: 4000 }, (_, i) => 1 + i * 0.25);
    const y = modelFrf(bar.model, 'B01:+Z', 'B01:+Z', f, 'mobility');
    for (let i = 0; i < f.length; i++) expect(y.re[i]).toBeGreaterThanOrEqual(0);
    const zModes = bar.model.modes.filter((m) => 'B01:+Z' in m.shape);
    const acc = modelFrf(bar.model, 'B01:+Z', 'B01:+Z', zModes.map((m) => m.fnHz), 'accelerance');
    for (const v of acc.im) expect(v).toBeGreaterThan(0);
  });

  it('has an antiresonance between each pair of adjacent driving-point resonances (docs/methods.md#modal-model)', () => {
    // Bending modes only: the two rigid-body modes on the supports (1.91 and 2.0 Hz, ζ = 4 %) overlap, and the
    // rule holds for well-separated modes.
    const zModes = bar.model.modes.filter((m) => 'B01:+Z' in m.shape && m.fnHz > 10).map((m) => m.fnHz);
    for (let r = 0; r + 1 < zModes.length; r++) {
      const f = Array.from({ length: 2001 }, (_, i) => zModes[r] + ((zModes[r + 1] - zModes[r]) * i) / 2000);
      const { re, im } = modelFrf(bar.model, 'B01:+Z', 'B01:+Z', f, 'accelerance');
      const mag = f.map((_, i) => Math.hypot(re[i], im[i]));
      const min = Math.min(...mag);
      // The minimum between the peaks is deep (< 1 % of the smaller peak): an antiresonance, not a shallow dip.
      expect(min).toBeLessThan(0.01 * Math.min(mag[0], mag[2000]));
    }
  });

  it('tends to the rigid-bar end mass line 4/m, and 1/m at the centre, for the ideal free–free bar (rigid-body modes at 0 Hz)', () => {
    const rigid = steelBar({ suspension: null });
    const m = 7850 * 0.04 * 0.01 * 1.0; // 3.14 kg (docs/methods.md#free-free-beam: ρA = 3.140 kg/m, L = 1 m)
    // Rigid bar struck at its end: translation 1/m plus rotation (L/2)²/(mL²/12) = 3/m gives 4/m.
    const a = at(rigid.model, 'B01:+Z', 'B01:+Z', 1, 'accelerance');
    close(a.re, 4 / m, 1e-3); // elastic modes add ≈ (1 Hz/53 Hz)² of this: < 0.1 %
    // At the centre the rotation has its node: only the translation 1/m is left (the whole mass m).
    const c = at(rigid.model, 'B11:+Z', 'B11:+Z', 1, 'accelerance');
    close(c.re, 1 / m, 1e-3);
  });

  it('shows the mass line on the demo bar between its supports and mode 1: |A| within 5 % of 4/m at the end from 8 to 12 Hz', () => {
    // Closed form (docs/methods.md#rigid-body): the rigid-body part is (4/m)·f²/(f² − f_s²) — +6.7 % at 8 Hz for
    // f_s = 2 Hz — and the bending modes take off (4/m)·Σ f²/(f_r² − f²) — −2.7 % at 8 Hz, −3.6 % at 12 Hz;
    // numpy on the same modal sum: |A|·m/4 = 1.0345 at 8 Hz, 0.9955 at 10 Hz, 0.9635 at 12 Hz.
    const m = 7850 * 0.04 * 0.01 * 1.0;
    for (const f of [8, 9, 10, 11, 12]) {
      const a = at(bar.model, 'B01:+Z', 'B01:+Z', f, 'accelerance');
      expect(Math.abs((Math.hypot(a.re, a.im) * m) / 4 - 1), `|A|·m/4 at ${f} Hz`).toBeLessThan(0.05);
      const r = at(bar.model, 'B21:+Z', 'B21:+Z', f, 'receptance');
      // Receptance below mode 1 follows the same line, 4/(mω²): it falls at 40 dB/decade instead of levelling off.
      expect(Math.abs((Math.hypot(r.re, r.im) * m * (2 * Math.PI * f) ** 2) / 4 - 1)).toBeLessThan(0.05);
    }
    const numpy = { 8: 1.0344974, 10: 0.9955115, 12: 0.9634767 };
    for (const [f, v] of Object.entries(numpy)) {
      const a = at(bar.model, 'B01:+Z', 'B01:+Z', Number(f), 'accelerance');
      expect(Math.abs((Math.hypot(a.re, a.im) * m) / 4 - v)).toBeLessThan(1e-6);
    }
    // Without the rigid-body modes the accelerance at 10 Hz is only the bending modes' stiffness line, (4/m)·Σ(f/f_r)² ≈ 4 %.
    const bare = steelBar({ rigidBody: false });
    const b = at(bare.model, 'B01:+Z', 'B01:+Z', 10, 'accelerance');
    expect((Math.hypot(b.re, b.im) * m) / 4).toBeLessThan(0.05);
  });

  it('reports the unbounded receptance at 0 Hz of a model with rigid-body modes as a RangeError', () => {
    const rigid = steelBar({ suspension: null });
    expect(() => modelFrf(rigid.model, 'B01:+Z', 'B01:+Z', [0], 'receptance')).toThrow(/fHz\[0\]=0/);
    const a = modelFrf(rigid.model, 'B01:+Z', 'B01:+Z', [0], 'accelerance');
    expect(Number.isFinite(a.re[0])).toBe(true);
  });
});

describe('modelFrf argument checks', () => {
  it('rejects NaN or negative frequencies, unknown DOFs and unknown kinds, naming the value', () => {
    expect(() => modelFrf(sdof, '1:+Z', '1:+Z', [10, Number.NaN], 'receptance')).toThrow(/fHz\[1\]=NaN/);
    expect(() => modelFrf(sdof, '1:+Z', '1:+Z', [-5], 'receptance')).toThrow(/fHz\[0\]=-5/);
    expect(() => modelFrf(sdof, '7:+Z', '1:+Z', [10], 'receptance')).toThrow(/7:\+Z/);
    expect(() => modelFrf(sdof, '1:+Z', '1:+Z', [10], 'inertance' as never)).toThrow(/kind="inertance"/);
  });
});
