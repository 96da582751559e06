// An unexpected console.error fails the test that caused it (shared/conventions.md, "Tests"),
// and one logged outside a test — in beforeAll or afterAll — fails the file.
// A test that expects an error log spies on console.error itself (vi.spyOn(...).mockImplementation).
import { afterAll, afterEach, beforeEach, vi } from 'vitest';

const original = console.error;
/** Calls made during the running test; null between tests. */
let inTest: unknown[][] | null = null;
const outsideTests: unknown[][] = [];

console.error = (...args: unknown[]) => {
  (inTest ?? outsideTests).push(args);
  original(...args);
};

const describeCalls = (calls: unknown[][]) => calls.map((a) => a.map(String).join(' ')).join(' | ');

beforeEach(() => {
  inTest = [];
});

afterEach(() => {
  const seen = inTest ?? [];
  inTest = null;
  vi.restoreAllMocks();
  if (seen.length > 0) throw new Error(`unexpected console.error during the test: ${describeCalls(seen)}`);
});

// Registered first, so it runs after the file's own afterAll hooks (vitest runs after-hooks as a stack).
afterAll(() => {
  if (outsideTests.length > 0) throw new Error(`unexpected console.error in beforeAll/afterAll: ${describeCalls(outsideTests)}`);
});
