// @resonote/dsp — signal processing for impact-hammer FRF testing. Pure TypeScript, no I/O.
export type { Complex, WindowName, SpectrumScaling, ForceWindowOptions, ExponentialWindowOptions } from './types.ts';
export {
  transientSpectrum,
  energySpectralDensity,
  linearSpectrum,
  autopowerSpectrum,
  type PeriodicSpectrumOptions,
} from './spectra.ts';
export { welchPsd, welchCsd, welchCoherence, type WelchOptions } from './welch.ts';
export { backgroundNoise, type BackgroundNoise, type BackgroundNoiseOptions } from './noise.ts';
export {
  analysisWindow,
  forceWindow,
  exponentialWindow,
  tauFromEndLevel,
  correctExponentialDamping,
} from './windows.ts';
export { findTrigger, type TriggerOptions, type TriggerResult } from './trigger.ts';
export {
  checkHit,
  defaultHitLimits,
  type HitLimits,
  type HitCheck,
  type HitReason,
  type HitReasonCode,
  type ResponseCheck,
} from './hit-check.ts';
export { forcePulseSpectrum, rollOffFrequency, type ForcePulseGate, type ForcePulseSpectrum } from './force-spectrum.ts';
export { FRF_ALGORITHM_VERSION } from './algorithm-version.ts';
export { fftPathName } from './fft.ts';
export { removeOffsets, channelOffset } from './offsets.ts';
export { splitRecords, type SplitOptions, type SplitRecords } from './records.ts';
export { averageFrf, FrfAccumulator, convertFrf, type Hit, type AverageFrfOptions, type AveragedFrf, type FrfKind } from './frf.ts';
export { mac, frac } from './assurance.ts';
export * from './modal/index.ts';
export { resamplePoly, resampleRatio, resampleFilter, type ResampleRatio } from './resample.ts';
export * from './correlation/index.ts';
export { unwrapPhase, unwrapPhaseDeg } from './unwrap.ts';
