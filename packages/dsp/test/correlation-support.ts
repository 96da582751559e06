// Test support for the correlation tests (src/correlation/*.test.ts): fixture loading and the simply supported beam.
import { loadModalFixture, repoRoot } from './modal-systems.ts';
import { resolve } from 'node:path';

export const correlationFixtureDir = resolve(repoRoot, 'tests/fixtures/correlation');

export function loadCorrelationFixture<T = any>(name: string, dir = correlationFixtureDir): T {
  return loadModalFixture<T>(name, dir);
}

/** Modes n = 1…count of a uniform simply supported beam, sin(nπx/L) (Blevins 1979), at x_i = i·L/(points − 1). */
export function simplySupportedBeam(count: number, points: number): Float64Array[] {
  return Array.from({ length: count }, (_, r) => Float64Array.from({ length: points }, (_, i) => Math.sin(((r + 1) * Math.PI * i) / (points - 1))));
}

export function expectClose(actual: ArrayLike<number>, expected: ArrayLike<number>, tol: number): void {
  if (actual.length !== expected.length) throw new Error(`length ${actual.length} ≠ ${expected.length}`);
  for (let i = 0; i < actual.length; i++) {
    if (!(Math.abs(actual[i]! - expected[i]!) <= tol * Math.max(1, Math.abs(expected[i]!)))) {
      throw new Error(`[${i}]: ${actual[i]} differs from ${expected[i]} by more than ${tol}`);
    }
  }
}
