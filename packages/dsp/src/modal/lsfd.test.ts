import { describe, expect, it } from 'vitest';
import { mac } from '../assurance.ts';
import { pickStablePoles } from './stability.ts';
import { stabilizationDiagram } from './lscf.ts';
import { estimateShapes, synthesize } from './lsfd.ts';
import { axis, loadModalFixture, maxRelDiff, peakRelDiff, threeDof, twoDof63 } from '../../test/modal-systems.ts';

const sys = loadModalFixture('systems.json');
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('estimateShapes and synthesize', () => {
  it('gives the exact 2-DOF shapes (MAC ≥ 0.999) and residues φ_jφ_k/(2jω_d) from the LSCF poles', () => {
    const set = twoDof63(axis(0, 0.125, 4097), [0]);
    const d = stabilizationDiagram(set, { bandHz: [50, 200], orders: [6, 8, 10] });
    const poles = pickStablePoles(d);
    expect(poles).toHaveLength(2);
    const model = estimateShapes(set, poles, { bandHz: [50, 200], residuals: true });
    const exact = [
      [1, 1],
      [1, -1],
    ];
    model.modes.forEach((m, r) => {
      // docs/methods.md#chain-2dof-lscf: modes [1, 1]/√2 and [1, −1]/√2 (scipy.linalg.eigh, fixture systems.json)
      expect(mac(m.shape, exact[r])).toBeGreaterThanOrEqual(0.999);
      expect(mac(m.shape, sys.twoDof63.modes[r])).toBeGreaterThanOrEqual(0.999);
      // docs/methods.md#modal-model: A_jk,r = φ_jrφ_kr/(2jω_dr) for proportional damping (φ mass-normalised, φ² = 1/2)
      const wd = sys.twoDof63.lambdaIm[r];
      for (let o = 0; o < 2; o++) {
        const exactIm = -(exact[r][o] * exact[r][0] * 0.5) / (2 * wd);
        expect(Math.hypot(m.residues[0].re[o], m.residues[0].im[o] - exactIm) / Math.abs(exactIm)).toBeLessThan(1e-3);
      }
      // proportional damping gives real (collinear) shapes: MPC = 1 (docs/methods.md#mpc)
      expect(m.mpc).toBeGreaterThan(0.999999);
    });
    // synthesized FRF within 1 % of the measured one at every line of the band
    const k0 = 400; // 50 Hz
    const k1 = 1601; // 200 Hz
    for (const q of set.frfs) {
      const h = synthesize(model, set.f, q.response, q.reference, 'receptance');
      expect(maxRelDiff(h, q.h, k0, k1)).toBeLessThan(0.01);
    }
  });

  it('gives the docs/methods.md#chain-3dof 3-DOF shapes from accelerance data, with residues in receptance form', () => {
    const f = axis(0, 0.01, 2001);
    const acc = threeDof(f, 'accelerance', [0]);
    const rec = threeDof(f, 'receptance', [0]);
    const d = stabilizationDiagram(acc, { bandHz: [1, 15], orders: [6, 8, 10, 12] });
    const model = estimateShapes(acc, pickStablePoles(d), { bandHz: [1, 15] });
    expect(model.kind).toBe('accelerance');
    const s = Math.SQRT1_2;
    // docs/methods.md#chain-3dof: modes [½, √2/2, ½], [−√2/2, 0, √2/2], [½, −√2/2, ½]
    const exact = [
      [0.5, s, 0.5],
      [-s, 0, s],
      [0.5, -s, 0.5],
    ];
    expect(model.modes).toHaveLength(3);
    model.modes.forEach((m, r) => {
      expect(mac(m.shape, exact[r])).toBeGreaterThanOrEqual(0.999);
      const wd = sys.threeDof73d.lambdaIm[r];
      for (let o = 0; o < 3; o++) {
        // docs/methods.md#modal-model: A_o1,r = φ_orφ_1r/(2jω_dr), independent of the FRF kind fitted
        const exactIm = -(exact[r][o] * exact[r][0]) / (2 * wd);
        expect(Math.hypot(m.residues[0].re[o], m.residues[0].im[o] - exactIm)).toBeLessThan(1e-3 * Math.abs(exact[r][0] / (2 * wd)));
      }
      // real approximation: largest magnitude 1, the exact mode's pattern up to a global sign
      const big = Math.max(...exact[r].map(Math.abs));
      const sign = Math.sign(m.realShape[0] * exact[r][0]);
      expect(Math.max(...Array.from(m.realShape, Math.abs))).toBeCloseTo(1, 12);
      m.realShape.forEach((v, o) => expect(v).toBeCloseTo((sign * exact[r][o]) / big, 3));
    });
    // the accelerance model synthesizes receptance too: within 1 % of the exact receptance over the band
    for (const q of rec.frfs) {
      const h = synthesize(model, f, q.response, q.reference, 'receptance');
      expect(maxRelDiff(h, q.h, 100, 1501)).toBeLessThan(0.01);
    }
  });

  it('needs its residual terms when modes lie outside the band', () => {
    // only the 7.12 Hz mode of the docs/methods.md#chain-3dof chain inside 6.5–7.8 Hz; the 3.85 and 9.30 Hz modes act as lower
    // (mass-like) and upper (stiffness-like) residuals (docs/methods.md#modal-model)
    const f = axis(0, 0.01, 2001);
    const set = threeDof(f, 'receptance', [0]);
    const pole = { fHz: sys.threeDof73d.fn[1], zeta: sys.threeDof73d.zeta[1] };
    const withRes = estimateShapes(set, [pole], { bandHz: [6.5, 7.8], residuals: true });
    const without = estimateShapes(set, [pole], { bandHz: [6.5, 7.8], residuals: false });
    expect(without.residuals).toBeNull();
    const err = (m: typeof withRes, dof: string) => {
      const q = set.frfs.find((x) => x.response === dof)!;
      // error relative to the FRF's peak level in the band (lines 650…780)
      return peakRelDiff(synthesize(m, f, q.response, q.reference, 'receptance'), q.h, 650, 781);
    };
    for (const dof of ['1', '3']) {
      // test thresholds: with residuals well under 1 % of the peak; without, three times worse and over 1 %
      expect(err(withRes, dof)).toBeLessThan(0.005);
      expect(err(without, dof)).toBeGreaterThan(0.01);
    }
    // DOF 2 is a node of mode 2 (docs/methods.md#chain-3dof, [−√2/2, 0, √2/2]): its FRF is residual terms only
    expect(err(withRes, '2')).toBeLessThan(0.1);
    expect(err(without, '2')).toBeGreaterThan(0.5);
    // the residue of the in-band mode stays close to A_11 = φ₁²/(2jω_d) with φ₁ = −√2/2 (docs/methods.md#modal-model)
    const A = withRes.modes[0].residues[0];
    expect(rel(A.im[0], -0.5 / (2 * sys.threeDof73d.lambdaIm[1]))).toBeLessThan(0.01);
    // a mode below the band looks mass-like: positive 1/M_L at the driving point (docs/methods.md#modal-model sign)
    expect(withRes.residuals!.lower[0][0]).toBeGreaterThan(0);
    // a mode above the band looks stiffness-like: positive 1/K_U at the driving point
    expect(withRes.residuals!.upper[0][0]).toBeGreaterThan(0);
  });

  it('accepts poles as λ as well as (f, ζ) and by reciprocity synthesizes the swapped pair', () => {
    const set = twoDof63(axis(0, 0.125, 4097), [0, 1]);
    const lam = [0, 1].map((r) => ({ lambda: { re: sys.twoDof63.lambdaRe[r], im: sys.twoDof63.lambdaIm[r] } }));
    const fz = [0, 1].map((r) => ({ fHz: sys.twoDof63.fn[r], zeta: sys.twoDof63.zeta[r] }));
    const a = estimateShapes(set, lam, { bandHz: [50, 200] });
    const b = estimateShapes(set, fz, { bandHz: [50, 200] });
    expect(a.modes[0].residues[1].im[0]).toBeCloseTo(b.modes[0].residues[1].im[0], 12);
    const h12 = synthesize(a, set.f, '1', '2', 'mobility');
    const h21 = synthesize(a, set.f, '2', '1', 'mobility');
    // reciprocity H_12 = H_21 (docs/methods.md#modal-model): the fitted residues agree to the fit's accuracy
    expect(maxRelDiff(h12, h21, 400, 1601)).toBeLessThan(1e-6);
  });
});
