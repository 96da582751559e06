// An unexpected console.error fails the test that caused it (shared/conventions.md, "Tests").
// A test that expects an error log spies on console.error itself (vi.spyOn(...).mockImplementation).
import { afterEach, beforeEach, vi } from 'vitest';

let calls: unknown[][] = [];
const original = console.error;

beforeEach(() => {
  calls = [];
  console.error = (...args: unknown[]) => {
    calls.push(args);
    original(...args);
  };
});

afterEach(() => {
  const seen = calls;
  console.error = original;
  vi.restoreAllMocks();
  if (seen.length > 0) {
    throw new Error(`unexpected console.error during the test: ${seen.map((a) => a.map(String).join(' ')).join(' | ')}`);
  }
});
