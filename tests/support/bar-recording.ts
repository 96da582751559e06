// A recording of simulated hammer hits on the bar campaign (tests/support/rig.ts), encoded as the
// front end would send it: volts (force × 2.25 mV/N, acceleration × 10.2 mV/(m/s²)) in a WAV.
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';
import { BAR_SETTINGS, type RigCampaign } from './rig.ts';

const bar = steelBar();

/** `count` clean hits at `excitationDof`, response at the reference B21:+Z, from the seeded rig. */
export function barWav(rig: RigCampaign, excitationDof: string, count: number, seed: number): Buffer {
  const fs = BAR_SETTINGS.sampleRateHz;
  const n = fs * BAR_SETTINGS.recordLengthS;
  // 50 N with a 1 ms contact (medium tip): the light bar's response stays inside the 500 m/s² range.
  const options = { excitationDof, responseDofs: ['B21:+Z'], fs, samples: n, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 };
  const hits = hitSeries(bar.model, options, count, createRng(seed), { doubleHitProbability: 0, overloadProbability: 0 });
  const force = new Float64Array(n * count);
  const accel = new Float64Array(n * count);
  hits.forEach((h, i) => {
    for (let k = 0; k < n; k++) {
      force[i * n + k] = (h.force[k]! * rig.hammerSensitivity) / 1000;
      accel[i * n + k] = (h.responses[0]![k]! * rig.accelSensitivity) / 1000;
    }
  });
  return encodeWav([force, accel], fs, 'float32', 1);
}
