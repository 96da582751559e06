// The fake audio input of the live-input browser tests: what an audio-class interface would
// deliver from the simulated steel bar (packages/sim), written as a stereo float WAV in
// digital units — force on input 1, the B21:+Z accelerometer on input 2, each divided by the
// channel's volts at full scale — so Chromium's fake capture device plays it into Tap (at 44.1 kHz, see FAKE_DEVICE_FS).
import { createRng, simulateHit, steelBar } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';

/** The campaign's rate. */
export const LIVE_FS = 48_000;
/**
 * The rate of the fake device's file. Chromium's fake capture device runs at 44.1 kHz and plays
 * the file's samples at its own rate without resampling them (measured with a ramp: the step per
 * captured sample is the file's step, whatever the header says), so the file is written at 44.1 kHz.
 */
export const FAKE_DEVICE_FS = 44_100;
/** The bar rig's sensitivities (tests/support/rig.ts) and the interface's full scales. */
export const LIVE_KIT = { hammerMvPerN: 2.25, accelMvPerMs2: 10.2, forceFullScaleV: 0.5, accelFullScaleV: 5 } as const;
/** Full scale in engineering units: 0.5 V / 2.25 mV/N = 222.2 N, 5 V / 10.2 mV/(m/s²) = 490.2 m/s². */
export const LIVE_RANGES = { forceRangeN: (LIVE_KIT.forceFullScaleV * 1000) / LIVE_KIT.hammerMvPerN, responseRangeMs2: (LIVE_KIT.accelFullScaleV * 1000) / LIVE_KIT.accelMvPerMs2 } as const;

export type LiveHitKind = 'clean' | 'double' | 'clipped';
/** The order of the hits in the file; Chromium loops it. */
export const LIVE_HITS: LiveHitKind[] = ['clean', 'double', 'clean', 'clipped', 'clean', 'clean'];
/** Seconds between hits: the bar's first mode (ζ ≈ 0.4 %) rings down by e^−10 before the next. */
export const LIVE_SPACING_S = 8;
/** Seconds of noise floor before the first hit. */
export const LIVE_LEAD_IN_S = 1;
const LEAD_IN_S = LIVE_LEAD_IN_S;

export function liveBarWav(excitationDof: string, options: { seed?: number; kinds?: LiveHitKind[]; spacingS?: number; fs?: number } = {}): { wav: Buffer; hitStartsS: number[] } {
  const fs = options.fs ?? FAKE_DEVICE_FS;
  const kinds = options.kinds ?? LIVE_HITS;
  const spacingS = options.spacingS ?? LIVE_SPACING_S;
  const seed = options.seed ?? 4242;
  const bar = steelBar();
  const rng = createRng(seed);
  const seg = Math.round(spacingS * fs);
  const lead = LEAD_IN_S * fs;
  const total = lead + kinds.length * seg;
  const force = new Float64Array(total);
  const accel = new Float64Array(total);
  const hitStartsS: number[] = [];
  // The lead-in: the noise floor alone (the same noise as during the hits).
  for (let i = 0; i < lead; i++) {
    force[i] = (0.02 * rng.gaussian() * LIVE_KIT.hammerMvPerN) / 1000 / LIVE_KIT.forceFullScaleV;
    accel[i] = (0.02 * rng.gaussian() * LIVE_KIT.accelMvPerMs2) / 1000 / LIVE_KIT.accelFullScaleV;
  }
  kinds.forEach((kind, h) => {
    const hit = simulateHit(
      bar.model,
      {
        excitationDof,
        responseDofs: ['B21:+Z'],
        fs,
        samples: seg,
        preTriggerS: 0.2,
        // The clipped hit: 1500 N into a 222 N full scale, flat at full scale for most of its contact.
        peakForceN: kind === 'clipped' ? 1500 : 50,
        pulseWidthS: 0.001,
        ...(kind === 'double' ? { doubleHit: { delayS: 0.004, ratio: 0.5 } } : {}),
        forceNoiseN: 0.02,
        responseNoise: 0.02,
        // The interface's full scale: the simulator's converter clips there, as the interface does.
        forceRangeN: LIVE_RANGES.forceRangeN,
        responseRangeMs2: LIVE_RANGES.responseRangeMs2,
        adcBits: 24,
      },
      rng,
    );
    const at = lead + h * seg;
    hitStartsS.push(at / fs + 0.2);
    for (let k = 0; k < seg; k++) {
      force[at + k] = (hit.force[k]! * LIVE_KIT.hammerMvPerN) / 1000 / LIVE_KIT.forceFullScaleV;
      accel[at + k] = (hit.responses[0]![k]! * LIVE_KIT.accelMvPerMs2) / 1000 / LIVE_KIT.accelFullScaleV;
    }
  });
  return { wav: encodeWav([force, accel], fs, 'float32', 1), hitStartsS };
}
