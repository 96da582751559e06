// `await expect(locator).toBeDefinedAndVisible()`: waits for a playwright locator to be visible.
// `await expect(locator).toHaveTextEventually(/…/)`: waits until the locator's text matches (a
// count that follows a refetch, for instance), instead of reading it once and racing the update.
import { expect } from 'vitest';
import type { Locator } from 'playwright-core';

expect.extend({
  async toBeDefinedAndVisible(received: Locator) {
    try {
      await received.waitFor({ state: 'visible', timeout: 10_000 });
      return { pass: true, message: () => 'locator is visible' };
    } catch (err) {
      return { pass: false, message: () => `locator did not become visible: ${(err as Error).message}` };
    }
  },
  async toHaveTextEventually(received: Locator, expected: RegExp | string) {
    const matches = (text: string | null) => text !== null && (typeof expected === 'string' ? text.includes(expected) : expected.test(text));
    const deadline = Date.now() + 10_000;
    let last: string | null = null;
    for (;;) {
      last = await received.textContent({ timeout: 10_000 }).catch(() => null);
      if (matches(last)) return { pass: true, message: () => `text ${JSON.stringify(last)} matches ${String(expected)}` };
      if (Date.now() > deadline) return { pass: false, message: () => `text ${JSON.stringify(last)} never matched ${String(expected)} within 10 s` };
      await received.page().waitForFunction(() => new Promise((r) => requestAnimationFrame(() => r(true))));
    }
  },
});

declare module 'vitest' {
  interface Assertion<T> {
    toBeDefinedAndVisible(): Promise<T>;
    toHaveTextEventually(expected: RegExp | string): Promise<T>;
  }
}
