// Debian's chromium driven by playwright-core (never a downloaded browser). Screenshots land in
// test-output/screenshots so a person can open and judge them.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';

export const screenshotDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../test-output/screenshots');

/** `extraArgs` add to the usual ones (e.g. fakeAudioInput(wav) for the live input). */
export async function launchBrowser(extraArgs: string[] = []): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.RESONOTE_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--ignore-gpu-blocklist', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', ...extraArgs],
  });
}

/**
 * Chromium's fake audio input playing `wavPath` (it loops the file) with the permission prompt
 * answered yes: what the live-input tests need instead of an audio interface.
 */
export function fakeAudioInput(wavPath: string): string[] {
  return ['--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream', `--use-file-for-fake-audio-capture=${wavPath}`, '--autoplay-policy=no-user-gesture-required'];
}

export const viewports = {
  laptop: { width: 1366, height: 768 },
  tablet: { width: 768, height: 1024 },
} as const;

export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  // The app bar sticks to the top of the viewport: from the top it lands where a reader sees it.
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/**
 * Waits until the page has stopped moving: web fonts loaded, no CSS transition or animation
 * running, then two animation frames so plotly has painted what it drew.
 * Tests call it before a screenshot instead of sleeping for a guessed time.
 */
export async function settled(page: Page): Promise<void> {
  await page.waitForFunction(
    async () => {
      await document.fonts.ready;
      return document.getAnimations().every((a) => a.playState !== 'running' || a.effect?.getComputedTiming().iterations === Infinity);
    },
    undefined,
    { timeout: 15_000 },
  );
  await page.evaluate(() => new Promise<void>((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => resolve()))));
}

/** Collects errors the page logs, so a test can assert there were none. */
export function watchConsole(page: Page): string[] {
  const errors: string[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error' && !/Failed to load resource: the server responded with a status of 40[13]/.test(msg.text())) errors.push(msg.text());
  });
  page.on('pageerror', (err) => errors.push(err.message));
  return errors;
}
