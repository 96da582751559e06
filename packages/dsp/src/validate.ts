// Argument checks shared by every public function. Errors name the offending value so a
// message read at the structure (or in a log) says exactly what to fix.

export function checkFs(fs: number, name = 'fs'): void {
  if (typeof fs !== 'number' || !Number.isFinite(fs) || fs <= 0) {
    throw new RangeError(`${name}=${String(fs)} must be > 0 and finite`);
  }
}

export function checkPositive(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name}=${String(value)} must be > 0 and finite`);
  }
}

export function checkNonNegative(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new RangeError(`${name}=${String(value)} must be >= 0 and finite`);
  }
}

export function checkFinite(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name}=${String(value)} must be finite`);
  }
}

export function checkInteger(value: number, name: string, min: number): void {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < min) {
    throw new RangeError(`${name}=${String(value)} must be an integer >= ${min}`);
  }
}

/** Checks that `x` is a non-empty array of finite numbers; returns its length. */
export function checkSamples(x: ArrayLike<number>, name: string, minLength = 1): number {
  if (x === null || x === undefined || typeof (x as ArrayLike<number>).length !== 'number') {
    throw new RangeError(`${name}=${String(x)} must be an array of numbers`);
  }
  const n = x.length;
  if (n < minLength) {
    throw new RangeError(
      n === 0 ? `${name} is empty (length 0)` : `${name} has length ${n}, needs at least ${minLength} samples`,
    );
  }
  // x*0 is 0 for every finite x and NaN otherwise, so one sum tells whether a scan is needed.
  let probe = 0;
  for (let i = 0; i < n; i++) probe += x[i] * 0;
  if (probe !== 0) {
    for (let i = 0; i < n; i++) {
      const v = x[i];
      if (typeof v !== 'number' || !Number.isFinite(v)) {
        throw new RangeError(`${name}[${i}]=${String(v)} is not finite`);
      }
    }
  }
  return n;
}

export function checkSameLength(n: number, m: number, nameA: string, nameB: string): void {
  if (n !== m) {
    throw new RangeError(`${nameB} has length ${m} but ${nameA} has length ${n}: lengths must match`);
  }
}
