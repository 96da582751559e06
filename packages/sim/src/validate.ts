// Argument checks shared by the public functions. Every failure is a RangeError that names the
// offending value (shared/conventions.md: "RangeError: fs=0 must be > 0"); nothing returns NaN.

/** Throws unless `value` is a finite number. */
export function requireFinite(name: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name}=${String(value)} must be a finite number`);
  }
  return value;
}

/** Throws unless `value` is a finite number > 0. */
export function requirePositive(name: string, value: unknown): number {
  const v = requireFinite(name, value);
  if (!(v > 0)) throw new RangeError(`${name}=${v} must be > 0`);
  return v;
}

/** Throws unless `value` is a finite number ≥ 0. */
export function requireNonNegative(name: string, value: unknown): number {
  const v = requireFinite(name, value);
  if (!(v >= 0)) throw new RangeError(`${name}=${v} must be >= 0`);
  return v;
}

/** Throws unless `value` is an integer within [min, max]. */
export function requireInteger(name: string, value: unknown, min: number, max = Number.MAX_SAFE_INTEGER): number {
  const v = requireFinite(name, value);
  if (!Number.isInteger(v) || v < min || v > max) {
    throw new RangeError(`${name}=${v} must be an integer in [${min}, ${max}]`);
  }
  return v;
}

/** Throws unless `value` is a probability in [0, 1]. */
export function requireProbability(name: string, value: unknown): number {
  const v = requireFinite(name, value);
  if (v < 0 || v > 1) throw new RangeError(`${name}=${v} must be in [0, 1]`);
  return v;
}
