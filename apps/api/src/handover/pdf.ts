// Prints the report HTML to an A4 PDF with the system Chromium (playwright-core drives it).
// One browser per request, always closed in `finally`, so no process outlives its request; at
// most two renders run at once, the rest wait their turn.
import { chromium } from 'playwright-core';
import { HttpError } from '../errors.ts';
import { esc } from './svg-frame.ts';

const CHROMIUM = '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
const MAX_PARALLEL = 2;

let running = 0;
const waiting: (() => void)[] = [];

async function slot<T>(work: () => Promise<T>): Promise<T> {
  if (running >= MAX_PARALLEL) await new Promise<void>((resolve) => waiting.push(resolve));
  running++;
  try {
    return await work();
  } finally {
    running--;
    waiting.shift()?.();
  }
}

export async function htmlToPdf(html: string, footerTitle: string): Promise<Buffer> {
  return slot(async () => {
    let browser;
    try {
      browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS, timeout: 30_000 });
    } catch (err) {
      throw new HttpError(503, 'pdf-unavailable', `The PDF printer (Chromium at ${CHROMIUM}) could not start: ${(err as Error).message.split('\n')[0]}. The HTML report is still available.`);
    }
    try {
      const page = await browser.newPage();
      // The report has no external assets; refuse any request so nothing leaves the server.
      await page.route('**/*', (route) => (route.request().url().startsWith('data:') ? route.continue() : route.abort()));
      await page.setContent(html, { waitUntil: 'load', timeout: 30_000 });
      const pdf = await page.pdf({
        format: 'A4',
        printBackground: true,
        preferCSSPageSize: true,
        displayHeaderFooter: true,
        headerTemplate: '<span></span>',
        footerTemplate: `<div style="font: 7pt system-ui, 'DejaVu Sans', sans-serif; color: #555; width: 100%; padding: 0 13mm; display: flex; justify-content: space-between;"><span>Resonote hand-over report · ${esc(footerTitle)}</span><span>page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`,
        margin: { top: '14mm', bottom: '16mm', left: '13mm', right: '13mm' },
      });
      return Buffer.from(pdf);
    } finally {
      await browser.close();
    }
  });
}
