import { requirePositive } from './validate.ts';

/**
 * Sensor output in volts for samples in engineering units: V = x · S / 1000, with S the
 * sensitivity in mV per unit (force: mV/N; acceleration: mV/(m/s²)) — docs/methods.md#units:
 * engineering units = volts ÷ sensitivity. Use it to make "raw volts" recordings of simulated hits.
 */
export function toVolts(samples: ArrayLike<number>, sensitivityMvPerUnit: number): Float64Array {
  const s = requirePositive('sensitivityMvPerUnit', sensitivityMvPerUnit) / 1000;
  const out = new Float64Array(samples.length);
  for (let n = 0; n < samples.length; n++) out[n] = samples[n] * s;
  return out;
}

/** Inverse of toVolts: engineering units = volts ÷ (sensitivity in mV/unit / 1000). */
export function fromVolts(volts: ArrayLike<number>, sensitivityMvPerUnit: number): Float64Array {
  const s = 1000 / requirePositive('sensitivityMvPerUnit', sensitivityMvPerUnit);
  const out = new Float64Array(volts.length);
  for (let n = 0; n < volts.length; n++) out[n] = volts[n] * s;
  return out;
}
