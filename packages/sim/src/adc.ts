import { requireInteger, requirePositive } from './validate.ts';

/** Quantisation step of a bipolar converter spanning ±range with `bits` bits: 2·range/2^bits. */
export function quantisationStep(range: number, bits: number): number {
  requirePositive('range', range);
  requireInteger('bits', bits, 2, 32);
  return (2 * range) / 2 ** bits;
}

/**
 * Digitises in place as a bipolar `bits`-bit converter over ±range: each value becomes
 * round(x/q)·q with q = 2·range/2^bits, and codes are limited to [−2^{bits−1}, 2^{bits−1} − 1],
 * so outputs lie in [−range, range − q] and never exceed the range. Returns true when any value
 * had to be limited (the front end's overload flag, docs/methods.md#overload).
 */
export function digitiseInPlace(samples: Float64Array, range: number, bits: number): boolean {
  const q = quantisationStep(range, bits);
  const maxCode = 2 ** (bits - 1) - 1;
  const minCode = -(2 ** (bits - 1));
  let overload = false;
  for (let n = 0; n < samples.length; n++) {
    let code = Math.round(samples[n] / q);
    if (code > maxCode) {
      code = maxCode;
      overload = true;
    } else if (code < minCode) {
      code = minCode;
      overload = true;
    }
    samples[n] = code * q;
  }
  return overload;
}

/** Copying form of digitiseInPlace: returns the digitised samples and the overload flag. */
export function digitise(samples: ArrayLike<number>, range: number, bits: number): { samples: Float64Array; overload: boolean } {
  const copy = Float64Array.from(samples);
  const overload = digitiseInPlace(copy, range, bits);
  return { samples: copy, overload };
}
