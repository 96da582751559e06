import { digitiseInPlace, quantisationStep } from './adc.ts';
import { decimationFilter, filterDecimate } from './anti-alias.ts';
import { parseDof } from './dof.ts';
import { addSdofHalfSineResponse, halfSineForce, type HalfSinePulse } from './half-sine.ts';
import { compileModel, shapeVector, type ModalModel } from './modal-model.ts';
import type { Rng } from './rng.ts';
import {
  requireFinite,
  requireInteger,
  requireNonNegative,
  requirePositive,
  requireProbability,
} from './validate.ts';

/** Settings of one simulated hammer hit. Units: N, m/s², s, Hz. */
export interface HitOptions {
  /** DOF the hammer strikes, in the direction of travel into the surface (docs/methods.md#dof-signs). */
  excitationDof: string;
  /** DOFs of the accelerometer channels (their positive sensing axes). */
  responseDofs: string[];
  /** Sample rate, Hz. */
  fs: number;
  /** Record length N, samples. */
  samples: number;
  /** Time from the first sample to the start of contact, s (the pre-trigger part of the record). */
  preTriggerS: number;
  /** Peak force A of the half-sine pulse, N. */
  peakForceN: number;
  /** Contact time T_c, s (harder tip → shorter contact → wider force spectrum, docs/methods.md#roll-off). */
  pulseWidthS: number;
  /** A second contact `delayS` after the start of the first (start to start), `ratio` × A high, same width. */
  doubleHit?: { delayS: number; ratio: number };
  /** RMS of white gaussian noise on the force channel, N (default 0). */
  forceNoiseN?: number;
  /** RMS of white gaussian noise on each response channel, m/s² (default 0). */
  responseNoise?: number;
  /** Input range of the force channel, ±N. */
  forceRangeN: number;
  /** Input range of the response channels, ±m/s²: one value for all or one per channel. */
  responseRangeMs2: number | number[];
  /** Converter resolution, bits (2…32, default 24). */
  adcBits?: number;
  /** Constant offsets added before digitising (force in N; responses in m/s², one or per channel). */
  dcOffset?: { forceN?: number; responseMs2?: number | number[] };
  /**
   * Pass the signals through the front end's anti-alias filter (anti-alias.ts): computed exactly
   * at `oversample`·fs, low-pass filtered at fs/2 and decimated, the same on every channel.
   * Default true, as in every real front end. Set false to get the exact samples of the
   * continuous signals (then force content above fs/2 aliases into the band).
   */
  antiAlias?: boolean;
  /** Oversampling factor of the anti-alias stage, integer 2…64 (default 8). */
  oversample?: number;
}

/** What the simulator put in, for checks and for the demo's "did the fit recover it" test. */
export interface HitTruth {
  excitationDof: string;
  responseDofs: string[];
  fs: number;
  samples: number;
  /** The contact pulses (one, or two for a double hit). */
  pulses: HalfSinePulse[];
  doubleHit: boolean;
  /** Analytic impulse Σ 2AT/π, N·s. */
  impulseNs: number;
  /** Quantisation steps, N and m/s² per channel. */
  quantStepForceN: number;
  quantStepResponseMs2: number[];
  /** Whether the anti-alias stage was applied, and its oversampling factor (1 when not). */
  antiAlias: boolean;
  oversample: number;
  /** Noise-free, offset-free, undigitised signals (after the anti-alias filter when it is on): force (N) and accelerations (m/s²). */
  cleanForce: Float64Array;
  cleanResponses: Float64Array[];
}

/** One triggered record: force (N) and accelerations (m/s²) sampled at t_n = n/fs. */
export interface SimulatedHit {
  force: Float64Array;
  responses: Float64Array[];
  /** True when a channel's converter was driven past its range (samples were limited). */
  overload: { force: boolean; responses: boolean[] };
  truth: HitTruth;
}

function perChannel(name: string, value: number | number[] | undefined, channels: number, fallback: number, positive: boolean): number[] {
  const check = (n: string, v: unknown) => (positive ? requirePositive(n, v) : requireFinite(n, v));
  if (value === undefined) return new Array<number>(channels).fill(fallback);
  if (Array.isArray(value)) {
    if (value.length !== channels) throw new RangeError(`${name} has ${value.length} entries for ${channels} response channels`);
    return value.map((v, i) => check(`${name}[${i}]`, v));
  }
  return new Array<number>(channels).fill(check(name, value));
}

/**
 * Simulates one hammer hit on a modal model.
 *
 * - Force: a half-sine A·sin(π(t − t₀)/T) from t₀ = preTriggerS (docs/methods.md#pulse-spectra), plus an
 *   optional second pulse for a double hit (docs/methods.md#double-hit).
 * - Response: acceleration a_i(t) = Σ_r φ_ir·φ_kr·q̈_r(t), with q̈_r the EXACT response of mode r
 *   (unit modal mass) to the force, from the closed-form Duhamel integral of a half-sine
 *   (half-sine.ts) — no time stepping.
 * - Front end: both signals are computed at `oversample`·fs and pass the same linear-phase
 *   anti-alias filter before decimation (anti-alias.ts; `antiAlias: false` skips it). So
 *   Δt·DFT(a)/Δt·DFT(f) of a fully decayed, noise-free record equals the accelerance of
 *   modelFrf to ~1e-4 across the band below 0.4·fs.
 * - Then, per channel: + DC offset + white gaussian noise (rms as given), then a `adcBits`
 *   converter over ±range (quantisation step 2·range/2^bits; values beyond the range are limited
 *   and set the overload flag, docs/methods.md#overload).
 *
 * Random numbers are drawn from `rng` in a fixed order (force noise, then each response channel),
 * so the same seed and options reproduce the record exactly.
 */
export function simulateHit(model: ModalModel, options: HitOptions, rng: Rng): SimulatedHit {
  const o = options;
  if (!o || typeof o !== 'object') throw new RangeError('options must be an object');
  const fs = requirePositive('fs', o.fs);
  const samples = requireInteger('samples', o.samples, 2, 1 << 26);
  const preTriggerS = requireNonNegative('preTriggerS', o.preTriggerS);
  const peakForceN = requirePositive('peakForceN', o.peakForceN);
  const widthS = requirePositive('pulseWidthS', o.pulseWidthS);
  const forceNoise = requireNonNegative('forceNoiseN', o.forceNoiseN ?? 0);
  const responseNoise = requireNonNegative('responseNoise', o.responseNoise ?? 0);
  const forceRange = requirePositive('forceRangeN', o.forceRangeN);
  const bits = requireInteger('adcBits', o.adcBits ?? 24, 2, 32);
  if (!rng || typeof rng.gaussian !== 'function') throw new RangeError('rng must come from createRng(seed)');
  if (!Array.isArray(o.responseDofs) || o.responseDofs.length === 0) {
    throw new RangeError('responseDofs must be a non-empty array of DOF labels');
  }
  const channels = o.responseDofs.length;
  const responseRanges = perChannel('responseRangeMs2', o.responseRangeMs2, channels, NaN, true);
  const forceOffset = requireFinite('dcOffset.forceN', o.dcOffset?.forceN ?? 0);
  const responseOffsets = perChannel('dcOffset.responseMs2', o.dcOffset?.responseMs2, channels, 0, false);

  const pulses: HalfSinePulse[] = [{ startS: preTriggerS, amplitudeN: peakForceN, widthS }];
  if (o.doubleHit !== undefined) {
    const delayS = requirePositive('doubleHit.delayS', o.doubleHit?.delayS);
    const ratio = requirePositive('doubleHit.ratio', o.doubleHit.ratio);
    if (delayS < widthS) {
      throw new RangeError(`doubleHit.delayS=${delayS} must be >= pulseWidthS=${widthS} (the second contact follows the first)`);
    }
    pulses.push({ startS: preTriggerS + delayS, amplitudeN: ratio * peakForceN, widthS });
  }
  const recordEnd = (samples - 1) / fs;
  const pulseEnd = pulses[pulses.length - 1].startS + widthS;
  if (pulseEnd > recordEnd) {
    throw new RangeError(
      `pulseWidthS=${widthS}: the force pulse${pulses.length > 1 ? ' (with its double hit)' : ''} ends at ${pulseEnd} s, ` +
        `after the last sample at ${recordEnd} s (preTriggerS=${preTriggerS}, samples=${samples}, fs=${fs})`,
    );
  }

  const compiled = compileModel(model);
  const excitationDof = parseDof(o.excitationDof).label;
  const phiK = shapeVector(compiled, excitationDof);
  const responseDofs = o.responseDofs.map((d) => parseDof(d).label);
  const phiJ = responseDofs.map((d) => shapeVector(compiled, d));

  // Clean signals, exact at the (over)sampling instants. With the anti-alias stage, high-rate
  // sample m lies at t = (m − D)/(R·fs), D = the filter's centre tap, so that output sample n
  // (centred on high-rate sample nR + D) lies at t = n/fs and the filter adds no delay.
  const antiAlias = o.antiAlias ?? true;
  const R = antiAlias ? requireInteger('oversample', o.oversample ?? 8, 2, 64) : 1;
  const taps = antiAlias ? decimationFilter(R) : null;
  const D = taps ? (taps.length - 1) / 2 : 0;
  const fsHi = fs * R;
  const hiLength = (samples - 1) * R + 1 + 2 * D;
  const hiPulses = pulses.map((p) => ({ ...p, startS: p.startS + D / fsHi }));
  const forceHi = halfSineForce(hiPulses, fsHi, hiLength);
  const responsesHi = responseDofs.map(() => new Float64Array(hiLength));
  const modal = new Float64Array(hiLength);
  for (let r = 0; r < compiled.count; r++) {
    if (phiK[r] === 0) continue;
    modal.fill(0);
    for (const pulse of hiPulses) addSdofHalfSineResponse(modal, compiled.omega[r], compiled.zeta[r], pulse, fsHi, 1, 2);
    for (let c = 0; c < channels; c++) {
      const gain = phiJ[c][r] * phiK[r];
      if (gain === 0) continue;
      const out = responsesHi[c];
      for (let n = 0; n < hiLength; n++) out[n] += gain * modal[n];
    }
  }
  let cleanForce = forceHi;
  let cleanResponses = responsesHi;
  if (taps) {
    cleanForce = new Float64Array(samples);
    filterDecimate(forceHi, taps, R, cleanForce);
    cleanResponses = responsesHi.map((x) => {
      const y = new Float64Array(samples);
      filterDecimate(x, taps, R, y);
      return y;
    });
  }

  // Measured signals: offset + noise, then the converter.
  const force = Float64Array.from(cleanForce);
  for (let n = 0; n < samples; n++) force[n] += forceOffset;
  if (forceNoise > 0) for (let n = 0; n < samples; n++) force[n] += forceNoise * rng.gaussian();
  const forceOverload = digitiseInPlace(force, forceRange, bits);

  const responses: Float64Array[] = [];
  const responseOverload: boolean[] = [];
  for (let c = 0; c < channels; c++) {
    const x = Float64Array.from(cleanResponses[c]);
    const offset = responseOffsets[c];
    for (let n = 0; n < samples; n++) x[n] += offset;
    if (responseNoise > 0) for (let n = 0; n < samples; n++) x[n] += responseNoise * rng.gaussian();
    responseOverload.push(digitiseInPlace(x, responseRanges[c], bits));
    responses.push(x);
  }

  return {
    force,
    responses,
    overload: { force: forceOverload, responses: responseOverload },
    truth: {
      excitationDof,
      responseDofs,
      fs,
      samples,
      pulses,
      doubleHit: pulses.length > 1,
      antiAlias,
      oversample: R,
      impulseNs: pulses.reduce((sum, p) => sum + (2 * p.amplitudeN * p.widthS) / Math.PI, 0),
      quantStepForceN: quantisationStep(forceRange, bits),
      quantStepResponseMs2: responseRanges.map((r) => quantisationStep(r, bits)),
      cleanForce,
      cleanResponses,
    },
  };
}

/** How hits vary within a series (a person holding a hammer). */
export interface HitVariation {
  /** Chance that a hit has a second contact (default 0). */
  doubleHitProbability?: number;
  /** Chance that a hit is struck hard enough to overload the force channel (default 0). */
  overloadProbability?: number;
  /** Log-normal spread of the peak force: A = peakForceN·e^{peakSpread·g}, g ~ N(0, 1) (default 0.15). */
  peakSpread?: number;
  /** Log-normal spread of the contact time: T = pulseWidthS·e^{widthSpread·g} (default 0.05). */
  widthSpread?: number;
}

/**
 * A series of `count` hits at one DOF, as a person would strike them: peak force and contact
 * time vary from hit to hit (log-normal spreads), some hits carry a double hit (second contact
 * 2–8 contact times later at 15–60 % of the first) and some are struck hard enough to overload
 * the force channel (peak 1.1–1.5 × forceRangeN). The drawn values are in each hit's `truth`.
 * All randomness comes from `rng`, so a seed reproduces the whole series.
 */
export function hitSeries(model: ModalModel, options: HitOptions, count: number, rng: Rng, variation: HitVariation = {}): SimulatedHit[] {
  requireInteger('count', count, 1, 100000);
  const pDouble = requireProbability('doubleHitProbability', variation.doubleHitProbability ?? 0);
  const pOverload = requireProbability('overloadProbability', variation.overloadProbability ?? 0);
  const peakSpread = requireNonNegative('peakSpread', variation.peakSpread ?? 0.15);
  const widthSpread = requireNonNegative('widthSpread', variation.widthSpread ?? 0.05);
  const fs = requirePositive('fs', options?.fs);
  const samples = requireInteger('samples', options.samples, 2, 1 << 26);
  const preTriggerS = requireNonNegative('preTriggerS', options.preTriggerS);
  const baseWidth = requirePositive('pulseWidthS', options.pulseWidthS);
  const basePeak = requirePositive('peakForceN', options.peakForceN);
  const forceRange = requirePositive('forceRangeN', options.forceRangeN);
  const room = (samples - 1) / fs - preTriggerS; // time from contact start to the last sample
  if (!(room >= baseWidth)) {
    throw new RangeError(`pulseWidthS=${baseWidth} does not fit after preTriggerS=${preTriggerS} in a record of ${samples} samples at fs=${fs}`);
  }

  const hits: SimulatedHit[] = [];
  for (let i = 0; i < count; i++) {
    // Draw every random quantity of this hit in a fixed order, used or not, so that changing one
    // probability does not shift the noise of the later hits.
    const gPeak = rng.gaussian();
    const gWidth = rng.gaussian();
    const uOverload = rng.uniform();
    const uOverloadLevel = rng.uniform();
    const uDouble = rng.uniform();
    const uDelay = rng.uniform();
    const uRatio = rng.uniform();

    const widthS = Math.min(baseWidth * Math.exp(widthSpread * gWidth), room);
    let peakForceN = basePeak * Math.exp(peakSpread * gPeak);
    if (uOverload < pOverload) peakForceN = forceRange * (1.1 + 0.4 * uOverloadLevel);
    let doubleHit: HitOptions['doubleHit'];
    if (uDouble < pDouble) {
      const maxDelay = Math.min(8 * widthS, room - widthS);
      const minDelay = Math.min(2 * widthS, maxDelay);
      if (maxDelay >= widthS) {
        doubleHit = { delayS: minDelay + (maxDelay - minDelay) * uDelay, ratio: 0.15 + 0.45 * uRatio };
      }
    }
    const { doubleHit: _ignored, ...rest } = options;
    hits.push(simulateHit(model, { ...rest, peakForceN, pulseWidthS: widthS, ...(doubleHit ? { doubleHit } : {}) }, rng));
  }
  return hits;
}
