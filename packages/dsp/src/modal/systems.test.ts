// The test systems themselves are checked first: the TypeScript builders against numpy/scipy fixtures
// (tests/reference/modal_fixtures.py → tests/fixtures/modal/) and against the check values of docs/methods.md#check-systems.
import { describe, expect, it } from 'vitest';
import { axis, fixedChain2, freeFreeRoot, freeFreeShape, lin, loadModalFixture, modalDamping, rayleigh, systemFrfs, threeDof, twoDof63 } from '../../test/modal-systems.ts';

const sys = loadModalFixture('systems.json');
const bar = loadModalFixture('free-free-bar.json');

function gridAt(set: ReturnType<typeof twoDof63>, k: number, n: number, refs: number[]) {
  // returns H[i][j] for references refs (columns)
  return Array.from({ length: n }, (_, i) =>
    refs.map((j) => {
      const x = set.frfs.find((q) => q.response === String(i + 1) && q.reference === String(j + 1))!;
      return { re: x.h.re[k], im: x.h.im[k] };
    }),
  );
}

/** Every H_ij of the n×n set equals the fixture's (re, im)[k][i·n + j] to 1e-10 relative, on a non-empty axis. */
function expectSameAsFixture(set: ReturnType<typeof twoDof63>, c: { f: number[]; re: number[][]; im: number[][] }, n: number) {
  expect(c.f.length).toBeGreaterThan(0);
  const refs = Array.from({ length: n }, (_, j) => j);
  for (let k = 0; k < c.f.length; k++) {
    const H = gridAt(set, k, n, refs);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const re = c.re[k][i * n + j];
        const im = c.im[k][i * n + j];
        expect(Math.hypot(H[i][j].re - re, H[i][j].im - im) / Math.hypot(re, im)).toBeLessThan(1e-10);
      }
    }
  }
}

describe('test systems', () => {
  it('builds the docs/methods.md#chain-2dof-lscf 2-DOF receptances exactly as numpy.linalg.inv(K − ω²M + jωC)', () => {
    const c = sys.twoDof63;
    const f = Float64Array.from(c.f as number[]);
    // numpy 2.4 fixture systems.json, rounding-level agreement
    expectSameAsFixture(twoDof63(f, [0, 1]), c, 2);
    // scipy.linalg.eig of the state matrix (fixture): Rayleigh damping gives exactly 1 % and 2 %
    expect(c.zeta[0]).toBeCloseTo(0.01, 12);
    expect(c.zeta[1]).toBeCloseTo(0.02, 12);
    // docs/methods.md#chain-2dof-lscf: f = 100.6584 and 174.3455 Hz
    expect(c.fn[0]).toBeCloseTo(100.6584, 4);
    expect(c.fn[1]).toBeCloseTo(174.3455, 4);
  });

  it('builds the docs/methods.md#chain-3dof 3-DOF receptances with modal damping exactly as numpy does', () => {
    const c = sys.threeDof73d;
    const f = Float64Array.from(c.f as number[]);
    // numpy 2.4 fixture systems.json (ω² = (2 − √2, 2, 2 + √2)·k/m, modes [½, √2/2, ½], [−√2/2, 0, √2/2], [½, −√2/2, ½])
    expectSameAsFixture(threeDof(f, 'receptance', [0, 1, 2]), c, 3);
    // docs/methods.md#chain-3dof: 3.85203, 7.11763 and 9.29963 Hz (scipy.linalg.eigh, fixture)
    expect(c.undampedHz[0]).toBeCloseTo(3.85203, 5);
    expect(c.undampedHz[1]).toBeCloseTo(7.11763, 5);
    expect(c.undampedHz[2]).toBeCloseTo(9.29963, 5);
    expect(c.zeta).toEqual([expect.closeTo(0.01, 12), expect.closeTo(0.015, 12), expect.closeTo(0.02, 12)]);
  });

  it('gives the damped docs/methods.md#chain-2dof check values α₁₁(6 Hz) and α₁₂(ω₂)', () => {
    const { M, K } = fixedChain2(1000);
    // docs/methods.md#chain-2dof: a = 0.801921 s⁻¹, b = 4.62990e-4 s give ζ = 2 % in both modes
    const { a, b } = rayleigh(0.02, Math.sqrt(1000), 0.02, Math.sqrt(3000));
    expect(a).toBeCloseTo(0.801921, 6);
    expect(b).toBeCloseTo(4.6299e-4, 9);
    const f = Float64Array.of(6, Math.sqrt(3000) / (2 * Math.PI));
    const set = systemFrfs(M, K, lin(a, M, b, K), f, [0]);
    const h11 = set.frfs[0].h;
    const h21 = set.frfs[1].h;
    // docs/methods.md#chain-2dof: α₁₁(6 Hz) = −8.56163e-4 − 1.49203e-4·j m/N
    expect(h11.re[0]).toBeCloseTo(-8.56163e-4, 9);
    expect(h11.im[0]).toBeCloseTo(-1.49203e-4, 9);
    // docs/methods.md#chain-2dof: α₁₂(ω₂) = −2.49700e-4 + 4.15802e-3·j m/N
    expect(h21.re[1]).toBeCloseTo(-2.497e-4, 9);
    expect(h21.im[1]).toBeCloseTo(4.15802e-3, 8);
  });

  it('solves the free–free beam equation and builds mass-normalised shapes as scipy brentq does', () => {
    for (let n = 0; n < 6; n++) {
      // scipy 1.17 brentq (fixture free-free-bar.json)
      expect(freeFreeRoot(n + 1)).toBeCloseTo(bar.betaL[n], 10);
      for (let i = 0; i < 21; i++) {
        expect(freeFreeShape(freeFreeRoot(n + 1), 1, 7850 * 4e-4, bar.x[i])).toBeCloseTo(bar.shapes[n][i], 8); // cosh − σ·sinh cancels: ~1e-9 is the formula's own rounding
      }
    }
    // docs/methods.md#free-free-beam: βL = 4.730041, 7.853205, 10.995608, 14.137165
    expect([1, 2, 3, 4].map(freeFreeRoot).map((v) => Number(v.toFixed(6)))).toEqual([4.730041, 7.853205, 10.995608, 14.137165]);
    const ei = (210e9 * 0.04 * 0.01 ** 3) / 12;
    const f = [1, 2, 3, 4].map((n) => freeFreeRoot(n) ** 2 / (2 * Math.PI) * Math.sqrt(ei / (7850 * 4e-4)));
    // docs/methods.md#free-free-beam table, weak direction: 53.17, 146.55, 287.30, 474.93 Hz
    expect(f.map((v) => Number(v.toFixed(2)))).toEqual([53.17, 146.55, 287.3, 474.93]);
    expect(axis(0, 0.5, 3)).toEqual(Float64Array.of(0, 0.5, 1));
  });
});
