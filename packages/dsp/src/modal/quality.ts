// Numbers behind the fit's warnings: per-FRF synthesis error, MPC per mode, and CMIF peaks that have no
// stable column of the stabilization diagram near them. The API turns them into words.
import { bandLines, toGrid } from './frf-set.ts';
import type { ModalModel } from './lsfd.ts';
import { synthesize } from './synthesize.ts';
import type { IndicatorCurves } from './cmif.ts';
import type { FrfSet } from './types.ts';

export interface FitQuality {
  /** Per FRF: 100·‖H − Ĥ‖/‖H‖ over the lines of the band (%), Ĥ synthesised from the model with its residual terms. */
  frfs: { response: string; reference: string; errorPercent: number }[];
  worstErrorPercent: number;
  /** Per mode: natural frequency (Hz) and MPC (Pappa, Elliott & Schenk 1993), 0…1. */
  modes: { fHz: number; mpc: number }[];
}

/** Synthesis error of each FRF of `frfSet` against `model` over `bandHz` (default the model's band), and MPC per mode. */
export function fitQuality(frfSet: FrfSet, model: ModalModel, bandHz?: [number, number]): FitQuality {
  const g = toGrid(frfSet);
  if (!model || !Array.isArray(model.modes)) throw new RangeError(`model=${String(model)} must come from estimateShapes`);
  const [k0, k1] = bandLines(g.f, bandHz ?? model.bandHz, 'bandHz');
  const f = g.f.subarray(k0, k1);
  const frfs: FitQuality['frfs'] = [];
  for (let o = 0; o < g.rows.length; o++) {
    for (let i = 0; i < g.cols.length; i++) {
      const [resp, ref] = g.transposed ? [g.cols[i], g.rows[o]] : [g.rows[o], g.cols[i]];
      const h = synthesize(model, f, resp, ref, g.kind);
      let e = 0;
      let s = 0;
      for (let k = 0; k < f.length; k++) {
        const hr = g.re[o][i][k0 + k];
        const hi = g.im[o][i][k0 + k];
        e += (hr - h.re[k]) ** 2 + (hi - h.im[k]) ** 2;
        s += hr * hr + hi * hi;
      }
      frfs.push({ response: resp, reference: ref, errorPercent: s > 0 ? 100 * Math.sqrt(e / s) : 0 });
    }
  }
  return {
    frfs,
    worstErrorPercent: Math.max(...frfs.map((x) => x.errorPercent)),
    modes: model.modes.map((m) => ({ fHz: m.fHz, mpc: m.mpc })),
  };
}

export interface CmifPeakCheckOptions {
  /** Band of the check (Hz); default the whole curve. */
  bandHz?: [number, number];
  /** A peak counts when it stands this factor above the lowest value on each side before a higher point; default 1.41 (3 dB). */
  prominence?: number;
  /** A column "near" a peak lies within this relative distance, or 2 lines; default 0.01. */
  tolerance?: number;
}

/**
 * Peaks of the first CMIF curve (Shih et al. 1988) inside the band with no mode frequency nearby — the
 * frequencies of the diagram's stable columns (e.g. `suggestModes(...).map(m => m.frequencyHz)`). A peak is a
 * local maximum standing `prominence` above the lowest value between it and the nearest higher value on each
 * side (or the band's edge). Returns those peaks, by frequency, with the CMIF value (units of the FRFs).
 */
export function cmifPeaksWithoutColumn(
  indicator: IndicatorCurves,
  columnsHz: readonly number[],
  options: CmifPeakCheckOptions = {},
): { fHz: number; value: number }[] {
  if (!indicator || !(indicator.f instanceof Float64Array) || !Array.isArray(indicator.values) || indicator.values.length === 0) {
    throw new RangeError('indicator must be the result of cmif()');
  }
  if (!Array.isArray(columnsHz) || columnsHz.some((v) => typeof v !== 'number' || !Number.isFinite(v))) {
    throw new RangeError('columnsHz must be an array of frequencies in Hz');
  }
  const prom = options.prominence ?? Math.SQRT2;
  const tol = options.tolerance ?? 0.01;
  if (!(prom > 1 && Number.isFinite(prom))) throw new RangeError(`prominence=${String(prom)} must be > 1`);
  if (!(tol > 0 && tol < 0.5)) throw new RangeError(`tolerance=${String(tol)} must be in (0, 0.5)`);
  const f = indicator.f;
  const v = indicator.values[0];
  const [k0, k1] = bandLines(f, options.bandHz, 'bandHz');
  const df = f.length > 1 ? f[1] - f[0] : 0;
  const out: { fHz: number; value: number }[] = [];
  for (let k = k0 + 1; k < k1 - 1; k++) {
    if (!(v[k] > v[k - 1] && v[k] >= v[k + 1])) continue;
    let left = v[k];
    for (let q = k - 1; q >= k0 && v[q] <= v[k]; q--) left = Math.min(left, v[q]);
    let right = v[k];
    for (let q = k + 1; q < k1 && v[q] <= v[k]; q++) right = Math.min(right, v[q]);
    if (!(v[k] >= prom * Math.max(left, right))) continue;
    const near = columnsHz.some((c) => Math.abs(c - f[k]) <= Math.max(tol * f[k], 2 * df));
    if (!near) out.push({ fHz: f[k], value: v[k] });
  }
  return out;
}
