// `await expect(locator).toBeDefinedAndVisible()`: waits for a playwright locator to be visible.
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
});

declare module 'vitest' {
  interface Assertion<T> {
    toBeDefinedAndVisible(): Promise<T>;
  }
}
