import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { repoRoot } from '../../test/modal-systems.ts';
import { correlationFixtureDir, loadCorrelationFixture } from '../../test/correlation-support.ts';

const hasScipy = spawnSync('python3', ['-c', 'import scipy'], { stdio: 'ignore' }).status === 0;

function close(a: unknown, b: unknown, tol: number): boolean {
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, i) => close(v, b[i], tol));
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const ka = Object.keys(a).sort();
    const kb = Object.keys(b).sort();
    return ka.join() === kb.join() && ka.every((k) => close((a as any)[k], (b as any)[k], tol));
  }
  return a === b;
}

describe('correlation reference fixtures', () => {
  it.skipIf(!hasScipy)(
    'are reproduced by tests/reference/efi_reference.py (skipped when python3 cannot import scipy)',
    () => {
      const dir = mkdtempSync(join(tmpdir(), 'correlation-fixtures-'));
      try {
        execFileSync('python3', [resolve(repoRoot, 'tests/reference/efi_reference.py'), dir], { stdio: 'pipe' });
        const committed = readdirSync(correlationFixtureDir).filter((f) => f.endsWith('.json')).sort();
        expect(readdirSync(dir).sort()).toEqual(committed);
        for (const name of committed) {
          const fresh = loadCorrelationFixture(name, dir);
          const old = loadCorrelationFixture(name);
          delete fresh.versions;
          delete old.versions;
          // same script: numbers agree to rounding (BLAS/libm may differ between machines)
          expect(close(fresh, old, 1e-9), name).toBe(true);
        }
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
    120_000,
  );
});
