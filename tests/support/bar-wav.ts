// Clean hits of the simulated steel bar as a float WAV of volts, as a rig's recorder would write
// them (2.25 mV/N hammer, 10.2 mV/(m/s²) accelerometer: the sensitivities of support/rig.ts).
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';
import { BAR_SETTINGS, type RigCampaign } from './rig.ts';

/** `recordLengthS` must match the campaign's settings (BAR_SETTINGS unless the test changed it). */
export function barHitsWav(rig: RigCampaign, options: { excitationDof: string; count: number; seed: number; recordLengthS?: number }): Buffer {
  const fs = BAR_SETTINGS.sampleRateHz;
  const n = fs * (options.recordLengthS ?? BAR_SETTINGS.recordLengthS);
  const hits = hitSeries(steelBar().model, { excitationDof: options.excitationDof, responseDofs: ['B21:+Z'], fs, samples: n, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, options.count, createRng(options.seed), {
    doubleHitProbability: 0,
    overloadProbability: 0,
  });
  const force = new Float64Array(options.count * n);
  const accel = new Float64Array(options.count * n);
  hits.forEach((h, i) => {
    for (let k = 0; k < n; k++) {
      force[i * n + k] = (h.force[k]! * rig.hammerSensitivity) / 1000;
      accel[i * n + k] = (h.responses[0]![k]! * rig.accelSensitivity) / 1000;
    }
  });
  return encodeWav([force, accel], fs, 'float32', 1);
}
