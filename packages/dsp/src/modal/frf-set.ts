// Validation of an FRF set and its arrangement as an N_o × N_i matrix per line. Internal.
import { checkSamples, checkSameLength } from '../validate.ts';
import type { FrfSet, ModalFrfKind } from './types.ts';

const KINDS: readonly ModalFrfKind[] = ['receptance', 'mobility', 'accelerance'];

/** Power of jω that turns receptance into the given kind: 0, 1 or 2. */
export function kindPower(kind: ModalFrfKind, name = 'kind'): 0 | 1 | 2 {
  const p = KINDS.indexOf(kind);
  if (p < 0) throw new RangeError(`${name}=${String(kind)} must be 'receptance', 'mobility' or 'accelerance'`);
  return p as 0 | 1 | 2;
}

/**
 * The FRFs arranged as a grid: rows[o] and cols[i] are the DOF labels; re[o][i], im[o][i] the FRF of
 * (row o, column i). When the set has more references than responses (a roving-hammer test) the grid is
 * transposed by reciprocity, H_ij = H_ji (docs/methods.md#modal-model): rows are then the reference DOFs.
 */
export interface FrfGrid {
  f: Float64Array;
  kind: ModalFrfKind;
  rows: string[];
  cols: string[];
  transposed: boolean;
  re: Float64Array[][];
  im: Float64Array[][];
}

export function checkFrequencyAxis(f: Float64Array, name: string): number {
  const n = checkSamples(f, name);
  for (let k = 0; k < n; k++) {
    if (f[k] < 0) throw new RangeError(`${name}[${k}]=${f[k]} Hz is negative`);
    if (k > 0 && !(f[k] > f[k - 1])) {
      throw new RangeError(`${name}[${k}]=${f[k]} Hz is not above ${name}[${k - 1}]=${f[k - 1]} Hz: the axis must increase`);
    }
  }
  return n;
}

/** Checks an FRF set (finite values, equal lengths, one FRF per pair, a complete grid) and arranges it. */
export function toGrid(set: FrfSet, name = 'frfSet'): FrfGrid {
  if (!set || typeof set !== 'object') throw new RangeError(`${name}=${String(set)} must be an FRF set`);
  kindPower(set.kind, `${name}.kind`);
  if (!(set.f instanceof Float64Array)) throw new RangeError(`${name}.f must be a Float64Array of frequencies in Hz`);
  const n = checkFrequencyAxis(set.f, `${name}.f`);
  if (!Array.isArray(set.frfs) || set.frfs.length === 0) throw new RangeError(`${name}.frfs is empty: give at least one FRF`);
  const resp: string[] = [];
  const refs: string[] = [];
  const seen = new Map<string, number>();
  set.frfs.forEach((x, q) => {
    const nm = `${name}.frfs[${q}]`;
    if (!x || typeof x.response !== 'string' || x.response === '') throw new RangeError(`${nm}.response=${String(x?.response)} must be a DOF label`);
    if (typeof x.reference !== 'string' || x.reference === '') throw new RangeError(`${nm}.reference=${String(x.reference)} must be a DOF label`);
    if (!x.h || !x.h.re || !x.h.im) throw new RangeError(`${nm}.h must have re and im arrays`);
    checkSameLength(n, checkSamples(x.h.re, `${nm}.h.re`), `${name}.f`, `${nm}.h.re`);
    checkSameLength(n, checkSamples(x.h.im, `${nm}.h.im`), `${name}.f`, `${nm}.h.im`);
    const key = `${x.response}\u0000${x.reference}`;
    if (seen.has(key)) {
      throw new RangeError(`${nm} repeats the pair (response ${x.response}, reference ${x.reference}) of ${name}.frfs[${seen.get(key)}]`);
    }
    seen.set(key, q);
    if (!resp.includes(x.response)) resp.push(x.response);
    if (!refs.includes(x.reference)) refs.push(x.reference);
  });
  const transposed = refs.length > resp.length;
  const rows = transposed ? refs : resp;
  const cols = transposed ? resp : refs;
  const re: Float64Array[][] = [];
  const im: Float64Array[][] = [];
  for (const r of rows) {
    const rr: Float64Array[] = [];
    const ii: Float64Array[] = [];
    for (const c of cols) {
      const q = seen.get(transposed ? `${c}\u0000${r}` : `${r}\u0000${c}`);
      if (q === undefined) {
        const [a, b] = transposed ? [c, r] : [r, c];
        throw new RangeError(
          `${name}.frfs lacks the FRF of response ${a}, reference ${b}: every response needs an FRF for every reference`,
        );
      }
      const h = set.frfs[q].h;
      rr.push(h.re instanceof Float64Array ? h.re : Float64Array.from(h.re));
      ii.push(h.im instanceof Float64Array ? h.im : Float64Array.from(h.im));
    }
    re.push(rr);
    im.push(ii);
  }
  return { f: set.f, kind: set.kind, rows, cols, transposed, re, im };
}

/** Checks a band [lo, hi] (Hz) and returns the index range [k0, k1) of the lines of f inside it. */
export function bandLines(f: Float64Array, band: readonly [number, number] | undefined, name = 'bandHz'): [number, number, number, number] {
  const lo = band ? band[0] : f[0];
  const hi = band ? band[1] : f[f.length - 1];
  if (band !== undefined) {
    if (!Array.isArray(band) || band.length !== 2) throw new RangeError(`${name}=${String(band)} must be [lo, hi] in Hz`);
    if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError(`${name} [${lo}, ${hi}] Hz must be finite`);
    if (lo < 0) throw new RangeError(`${name} [${lo}, ${hi}] Hz starts below 0 Hz`);
    if (!(hi > lo)) throw new RangeError(`${name} [${lo}, ${hi}] Hz is empty`);
  }
  let k0 = 0;
  while (k0 < f.length && f[k0] < lo) k0++;
  let k1 = k0;
  while (k1 < f.length && f[k1] <= hi) k1++;
  if (k1 === k0) {
    throw new RangeError(
      `${name} [${lo}, ${hi}] Hz holds no lines of the frequency axis (${f[0]}–${f[f.length - 1]} Hz)`,
    );
  }
  return [k0, k1, lo, hi];
}
