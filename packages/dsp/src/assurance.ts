import type { Complex } from './types.ts';
import { checkSameLength, checkSamples } from './validate.ts';

type Vector = ArrayLike<number> | Complex;

function parts(v: Vector, name: string): { re: ArrayLike<number>; im: ArrayLike<number> | null; n: number } {
  if (v && typeof (v as Complex).re === 'object' && typeof (v as Complex).im === 'object' && (v as Complex).re !== null) {
    const c = v as Complex;
    const n = checkSamples(c.re, `${name}.re`);
    checkSameLength(n, checkSamples(c.im, `${name}.im`), `${name}.re`, `${name}.im`);
    return { re: c.re, im: c.im, n };
  }
  const r = v as ArrayLike<number>;
  return { re: r, im: null, n: checkSamples(r, name) };
}

/** |aᴴb|² / ((aᴴa)(bᴴb)) for real or complex vectors; 0 when either vector is all zeros. */
function assurance(a: Vector, b: Vector, names: [string, string]): number {
  const A = parts(a, names[0]);
  const B = parts(b, names[1]);
  checkSameLength(A.n, B.n, names[0], names[1]);
  let cr = 0;
  let ci = 0;
  let aa = 0;
  let bb = 0;
  for (let k = 0; k < A.n; k++) {
    const ar = A.re[k];
    const ai = A.im ? A.im[k] : 0;
    const br = B.re[k];
    const bi = B.im ? B.im[k] : 0;
    // conj(a)·b
    cr += ar * br + ai * bi;
    ci += ar * bi - ai * br;
    aa += ar * ar + ai * ai;
    bb += br * br + bi * bi;
  }
  const den = aa * bb;
  return den > 0 ? Math.min(1, (cr * cr + ci * ci) / den) : 0;
}

/**
 * Modal Assurance Criterion, MAC(φa, φb) = |φaᴴφb|² / ((φaᴴφa)(φbᴴφb)), between 0 and 1.
 * Real or complex shape vectors of equal length (dimensionless result; insensitive to any complex
 * scale factor; not an orthogonality check, no mass weighting). 0 if either vector is all zeros.
 * Source: Allemang & Brown, "A correlation coefficient for modal vector analysis", IMAC 1 (1982),
 * pp. 110–116 (docs/methods.md#mac).
 */
export function mac(a: Vector, b: Vector): number {
  return assurance(a, b, ['a', 'b']);
}

/**
 * Frequency Response Assurance Criterion over the given lines,
 * FRAC = |Σ Ha*·Hb|² / (Σ|Ha|²·Σ|Hb|²), between 0 and 1. Blind to a constant complex factor, so pair
 * it with a level check. Source: Heylen & Lammens 1996, listed in Allemang 2003 (docs/methods.md#mac).
 */
export function frac(ha: Complex, hb: Complex): number {
  return assurance(ha, hb, ['ha', 'hb']);
}
