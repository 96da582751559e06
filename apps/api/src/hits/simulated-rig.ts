// The "simulated rig": hits from @resonote/sim for any campaign, so anyone can try Resonote
// without hardware. The demo bar and baseplate use their own models; any other geometry gets a
// beam-like model along its longest extent (the free-free bar's Euler–Bernoulli modes scaled to
// that length) — invented, for trying the workflow, not a model of the real structure.
import { createRng, hitSeries, pumpSkidBaseplate, steelBarModel, type ModalModel } from '@resonote/sim';
import type { AcquisitionSettings } from '@resonote/contracts';
import { badRequest } from '../errors.ts';
import { recordSamples } from './current-settings.ts';

export interface RigPoint {
  label: string;
  x: number;
  y: number;
  z: number;
}

export function rigModel(kind: 'steel-bar' | 'pump-skid' | 'generic', points: RigPoint[]): ModalModel {
  if (points.length === 0) throw new RangeError('the campaign has no points to simulate');
  if (kind === 'pump-skid') {
    const plate = pumpSkidBaseplate();
    const labels = new Set(plate.points.map((p) => p.label));
    if (points.every((p) => labels.has(p.label))) return plate.model;
  }
  const extent = (axis: 'x' | 'y' | 'z') => Math.max(...points.map((p) => p[axis])) - Math.min(...points.map((p) => p[axis]));
  const axis = kind === 'steel-bar' ? 'x' : (['x', 'y', 'z'] as const).reduce((a, b) => (extent(b) > extent(a) ? b : a));
  const min = Math.min(...points.map((p) => p[axis]));
  const lengthMm = Math.max(extent(axis), 100);
  return steelBarModel({
    points: points.map((p) => ({ label: p.label, xM: (p[axis] - min) / 1000 })),
    lengthM: kind === 'steel-bar' ? Math.max(lengthMm, 1000) / 1000 : lengthMm / 1000,
  });
}

/** Contact time of the hammer tips offered by the simulated rig (harder tip → shorter contact, docs/methods.md#roll-off). */
export const rigTips = { soft: 2.0e-3, medium: 0.8e-3, hard: 0.3e-3 } as const;

/** Noise floors of the rig's measurement chain, rms: invented for a plausible IEPE chain, not a datasheet value. */
export const rigNoise = { forceN: 0.02, responseMs2: 0.005 } as const;

export interface RigStrike {
  count: number;
  tip: keyof typeof rigTips;
  peakForceN?: number;
  seed: number;
  doubleHitProbability: number;
  overloadProbability: number;
}

/**
 * `count` hits of the rig at one entry as one continuous recording, records back to back (as a
 * front end streams them), one stream per channel of `map` in its order. 400 when the rig cannot
 * strike there (the model has no such DOF).
 */
export function rigRecording(model: ModalModel, entry: { excitationDof: string }, map: readonly { channel: number; role: 'force' | 'response'; dof: string }[], s: AcquisitionSettings, strike: RigStrike): Float64Array[] {
  const responses = map.filter((m) => m.role === 'response');
  const n = recordSamples(s);
  let hits;
  try {
    hits = hitSeries(
      model,
      {
        excitationDof: entry.excitationDof,
        responseDofs: responses.map((r) => r.dof),
        fs: s.sampleRateHz,
        samples: n,
        preTriggerS: s.preTriggerS + 0.5 / s.sampleRateHz,
        peakForceN: strike.peakForceN ?? Math.min(0.02 * s.forceRangeN, 100),
        pulseWidthS: rigTips[strike.tip],
        forceNoiseN: rigNoise.forceN,
        responseNoise: rigNoise.responseMs2,
        forceRangeN: s.forceRangeN,
        responseRangeMs2: s.responseRangeMs2,
        adcBits: 24,
      },
      strike.count,
      createRng(strike.seed),
      { doubleHitProbability: strike.doubleHitProbability, overloadProbability: strike.overloadProbability },
    );
  } catch (err) {
    if (err instanceof RangeError) throw badRequest(`The simulated rig cannot strike here: ${err.message}`);
    throw err;
  }
  return map.map((m) => {
    const out = new Float64Array(n * hits.length);
    hits.forEach((h, i) => {
      const src = m.role === 'force' ? h.force : h.responses[responses.findIndex((r) => r.channel === m.channel)]!;
      out.set(src, i * n);
    });
    return out;
  });
}
