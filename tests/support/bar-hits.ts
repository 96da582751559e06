// Simulated hits on the rig's steel bar (support/rig.ts) and the WAV the front end would record of
// them, shared by the hit tests: the same simulator options, volts through the rig's sensitivities.
import { createRng, hitSeries, simulateHit, steelBar } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';
import { BAR_SETTINGS, type RigCampaign } from './rig.ts';

const bar = steelBar();
/** Samples per record at the rig's settings. */
export const BAR_RECORD_SAMPLES = BAR_SETTINGS.sampleRateHz * BAR_SETTINGS.recordLengthS;

/** The options for `count` hits at `fs` Hz (records as long as the rig's), for simulateBarHits' `extra`. */
export const atRate = (fs: number) => ({ fs, samples: Math.round(fs * BAR_SETTINGS.recordLengthS) });

/**
 * `count` hits at `excitationDof`, response at the driving point B21:+Z, from seed `seed`, without
 * double hits or overloads unless `extra` asks for a double hit (then every hit is one). 50 N with a
 * 1 ms contact (medium tip): the light bar's response stays inside the 500 m/s² range.
 */
export function simulateBarHits(excitationDof: string, count: number, seed: number, extra: Partial<Parameters<typeof hitSeries>[1]> = {}) {
  const options = { excitationDof, responseDofs: ['B21:+Z'], fs: BAR_SETTINGS.sampleRateHz, samples: BAR_RECORD_SAMPLES, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500, ...extra };
  if (extra.doubleHit) return Array.from({ length: count }, () => simulateHit(bar.model, options, createRng(seed)));
  return hitSeries(bar.model, options, count, createRng(seed), { doubleHitProbability: 0, overloadProbability: 0 });
}

/**
 * Volts as the front end would record them: force × the rig's hammer sensitivity (mV/N), acceleration × its
 * accelerometer's (mV/(m/s²)), the hits one after another at `fs` (Hz; the rig's rate unless given).
 */
export function barHitsWav(rig: Pick<RigCampaign, 'hammerSensitivity' | 'accelSensitivity'>, hits: ReturnType<typeof simulateBarHits>, format: 'float32' | 'pcm24' = 'float32', fs: number = BAR_SETTINGS.sampleRateHz) {
  const n = hits[0]?.force.length ?? 0;
  const force = new Float64Array(n * hits.length);
  const accel = new Float64Array(n * hits.length);
  hits.forEach((h, i) => {
    for (let k = 0; k < n; k++) {
      force[i * n + k] = (h.force[k]! * rig.hammerSensitivity) / 1000;
      accel[i * n + k] = (h.responses[0]![k]! * rig.accelSensitivity) / 1000;
    }
  });
  return encodeWav([force, accel], fs, format, format === 'float32' ? 1 : 10);
}
