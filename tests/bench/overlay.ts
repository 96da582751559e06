// Overlay speed (not a timed test): 100 synthetic FRFs × 8193 lines arrive in the Review page and
// are drawn; the page measures performance.now() from the parsed data to plotly_afterplot
// (components/review/overlay-chart.tsx). The built web app is served by a tiny static server and
// every /api call is answered here (page.route), so no database is needed.
//   pnpm --filter @resonote/web build && node --import tsx tests/bench/overlay.ts
// Options: RESONOTE_WEB_DIST=<dir> (default apps/web/dist), BENCH_RUNS=3, BENCH_CURVES=100, BENCH_LINES=8193.
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const dist = process.env.RESONOTE_WEB_DIST ?? path.join(root, 'apps/web/dist');
const runs = Number(process.env.BENCH_RUNS ?? 3);
const curves = Number(process.env.BENCH_CURVES ?? 100);
const lines = Number(process.env.BENCH_LINES ?? 8193);
const campaignId = '00000000-0000-4000-8000-000000000001';

if (!fs.existsSync(path.join(dist, 'index.html'))) throw new Error(`No built web app in ${dist}: run pnpm --filter @resonote/web build first.`);

/** A 3-mode accelerance with a little damping, different per curve, 0–fs/2 at 8193 lines. */
function synthetic() {
  const df = 0.25;
  const f = Array.from({ length: lines }, (_, k) => k * df);
  const frfs = [];
  for (let c = 0; c < curves; c++) {
    const re: number[] = new Array(lines);
    const im: number[] = new Array(lines);
    const modes = [53 + c * 0.05, 146.5 + c * 0.1, 287 + c * 0.2];
    for (let k = 0; k < lines; k++) {
      const w = 2 * Math.PI * f[k]!;
      let hr = 0;
      let hi = 0;
      for (const [i, fn] of modes.entries()) {
        const wn = 2 * Math.PI * fn;
        const a = (-w * w * (1 + 0.3 * Math.sin(c + i))) / 1.5;
        const dr = wn * wn - w * w;
        const di = 2 * 0.01 * wn * w;
        const d = dr * dr + di * di;
        hr += (a * dr) / d;
        hi += (-a * di) / d;
      }
      re[k] = hr;
      im[k] = hi;
    }
    frfs.push({ entryId: `e${c}`, responseDof: `B21:+Z`, excitationDof: `P${String(c + 1).padStart(3, '0')}:+Z`, averages: 5, f, h1: { re, im }, coherence: f.map(() => 0.99), meanCoherence: 0.99 });
  }
  return { kind: 'accelerance', unit: '(m/s²)/N', frfs };
}

const entries = Array.from({ length: curves }, (_, c) => ({
  id: `e${c}`,
  position: c + 1,
  responsePointId: 'r',
  responseLabel: 'B21',
  responseDirection: '+Z',
  excitationPointId: `p${c}`,
  excitationLabel: `P${String(c + 1).padStart(3, '0')}`,
  excitationDirection: '+Z',
  responseDof: 'B21:+Z',
  excitationDof: `P${String(c + 1).padStart(3, '0')}:+Z`,
  drivingPoint: false,
  status: 'done',
  requiredHits: 5,
  assigneeId: null,
  assigneeName: null,
  note: '',
  version: 1,
  acceptedHits: 5,
  rejectedHits: 0,
}));

const started = Date.now();
const overlayJson = JSON.stringify(synthetic());
console.log(`synthetic data: ${curves} FRFs × ${lines} lines, ${(overlayJson.length / 1e6).toFixed(1)} MB of JSON, built in ${Date.now() - started} ms`);

const api: Record<string, unknown> = {
  '/api/me': { user: { id: 'u1', email: 'bench@resonote.local', name: 'Bench', role: 'member' }, campaignCount: 1 },
  [`/api/campaigns/${campaignId}`]: {
    campaign: { id: campaignId, name: 'Overlay benchmark', structure: 'synthetic', client: '', purpose: 'calibrated-frf', status: 'analysis', testType: 'roving-hammer', referenceDofs: ['B21:+Z'], notes: '', simulator: 'generic', version: 1, updatedAt: new Date().toISOString() },
    myRole: 'viewer',
  },
  [`/api/campaigns/${campaignId}/schedule`]: { entries },
  [`/api/campaigns/${campaignId}/checks`]: { reciprocity: [], linearity: [], note: 'synthetic' },
  '/api/campaigns': { campaigns: [] },
};

const server = http.createServer((req, res) => {
  const url = new URL(req.url ?? '/', 'http://x');
  let file = path.join(dist, decodeURIComponent(url.pathname));
  if (!file.startsWith(dist) || !fs.existsSync(file) || fs.statSync(file).isDirectory()) file = path.join(dist, 'index.html');
  const type = file.endsWith('.js') ? 'text/javascript' : file.endsWith('.css') ? 'text/css' : file.endsWith('.woff2') ? 'font/woff2' : file.endsWith('.svg') ? 'image/svg+xml' : 'text/html';
  res.writeHead(200, { 'content-type': type });
  fs.createReadStream(file).pipe(res);
});
await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;

const browser = await chromium.launch({
  executablePath: process.env.RESONOTE_CHROMIUM ?? '/usr/bin/chromium',
  headless: true,
  args: ['--no-sandbox', '--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--ignore-gpu-blocklist', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
});
const results: number[] = [];
try {
  for (let run = 0; run < runs; run++) {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
    await page.route('**/api/**', async (route) => {
      const url = new URL(route.request().url());
      if (url.pathname === `/api/campaigns/${campaignId}/frfs`) return route.fulfill({ status: 200, contentType: 'application/json', body: overlayJson });
      if (url.pathname.endsWith('/events')) return route.fulfill({ status: 200, contentType: 'text/event-stream', body: ': bench\n\n' });
      const body = api[url.pathname];
      if (body === undefined) return route.fulfill({ status: 404, contentType: 'application/json', body: JSON.stringify({ error: { code: 'not-found', message: `bench has no ${url.pathname}` } }) });
      return route.fulfill({ status: 200, contentType: 'application/json', body: JSON.stringify(body) });
    });
    await page.goto(`${base}/campaigns/${campaignId}/review?view=overlay`);
    // As a person would: the page has opened (and loaded plotly) before FRFs are picked.
    await page.waitForFunction(() => window.__resonotePlotlyReady === true, undefined, { timeout: 60_000 });
    await page.getByTestId('pick-all-done').click();
    await page.waitForFunction(() => (window.__resonoteOverlayTimings?.length ?? 0) > 0, undefined, { timeout: 120_000 });
    const t = await page.evaluate(() => window.__resonoteOverlayTimings![0]!);
    const webgl = await page.evaluate(() => Boolean(document.querySelector('[data-testid="overlay-plot"] canvas')));
    const msg = await page.locator('[data-testid="overlay-plot"]').innerText();
    if (/WebGL is not supported/.test(msg)) console.log('  (plotly reports no WebGL)');
    console.log(`run ${run + 1}: ${t.curves} FRFs, ${t.points} lines in all, data parsed → plotly_afterplot ${t.ms.toFixed(0)} ms (${webgl ? 'WebGL' : 'SVG'})`);
    results.push(t.ms);
    if (run === 0) await page.screenshot({ path: path.join(root, 'test-output/screenshots/bench-overlay-1366.png'), timeout: 60_000 }).catch(() => console.log('  (no screenshot: the page was busy)'));
    await page.close();
  }
} finally {
  await browser.close();
  server.close();
}
results.sort((a, b) => a - b);
console.log(`median ${results[Math.floor(results.length / 2)]!.toFixed(0)} ms over ${results.length} runs (target ≤ 1000 ms)`);
