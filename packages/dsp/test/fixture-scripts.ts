// Re-running the reference scripts (tests/reference/*.py) that wrote a folder of committed fixtures:
// when python3 can import scipy, the scripts run into a temporary folder and must give exactly the
// committed files, with numbers equal to rounding (BLAS/libm may differ between machines).
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect } from 'vitest';
import { repoRoot } from './helpers.ts';

/** Whether python3 with scipy is on this machine (the regeneration tests are skipped without it). */
export const hasScipy = spawnSync('python3', ['-c', 'import scipy'], { stdio: 'ignore' }).status === 0;

/** Deep equality where numbers may differ by tol relative to max(1, |b|). */
export function closeWithin(a: unknown, b: unknown, tol: number): boolean {
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, i) => closeWithin(v, b[i], tol));
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const ka = Object.keys(a).sort();
    const kb = Object.keys(b).sort();
    return ka.join() === kb.join() && ka.every((k) => closeWithin((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], tol));
  }
  return a === b;
}

/**
 * Runs each script (a file name in tests/reference, given the output folder as its argument) into one
 * temporary folder and expects the same .json file names as `committedDir` (at least one) and, per file
 * read by `load` and without its `versions` entry, numbers equal within 1e-9 relative.
 */
export function expectScriptsReproduce(scripts: readonly string[], committedDir: string, load: (name: string, dir?: string) => Record<string, unknown>): void {
  const dir = mkdtempSync(join(tmpdir(), 'reference-fixtures-'));
  try {
    for (const script of scripts) execFileSync('python3', [resolve(repoRoot, 'tests/reference', script), dir], { stdio: 'pipe' });
    const committed = readdirSync(committedDir).filter((f) => f.endsWith('.json')).sort();
    expect(committed.length).toBeGreaterThan(0);
    expect(readdirSync(dir).sort()).toEqual(committed);
    for (const name of committed) {
      const fresh = load(name, dir);
      const old = load(name);
      delete fresh.versions;
      delete old.versions;
      expect(closeWithin(fresh, old, 1e-9), name).toBe(true);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
