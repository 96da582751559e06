// Hostile and broken input (issue 13, items 3, 4 and 8): recordings with values no sensor can
// give, lying WAV headers, CSV cells that are not decimal numbers, binary files named .csv, a
// multipart body cut off before its end, an oversized auth body on a keep-alive connection, and
// clients that trickle their request a byte at a time. Each is answered with a 4xx in the one error
// shape that names what was wrong, and stores nothing — against the real API and database.
import http from 'node:http';
import net from 'node:net';
import { describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { strToU8, unzipSync, zipSync } from 'fflate';
import { campaign, hit, noiseCheck, point } from '@resonote/db/schema';
import { encodeWav } from '@resonote/api/recording';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';
import { PASSWORD } from '../support/accounts.ts';

let app: TestApp & { baseUrl: string };
let lead: Person;
let engineer: Person;
let rig: RigCampaign;
let barPoints: number;

const fs = BAR_SETTINGS.sampleRateHz;

async function hitRows(): Promise<number> {
  const [row] = await app.handle.database.db.select({ n: count() }).from(hit).where(eq(hit.campaignId, rig.campaignId));
  return row!.n;
}
async function noiseRows(): Promise<number> {
  const [row] = await app.handle.database.db.select({ n: count() }).from(noiseCheck).where(eq(noiseCheck.campaignId, rig.campaignId));
  return row!.n;
}
async function pointRows(): Promise<number> {
  const [row] = await app.handle.database.db.select({ n: count() }).from(point).where(eq(point.campaignId, rig.campaignId));
  return row!.n;
}

/** Two quiet channels of 256 samples (force, acceleration) in volts, with one value replaced. */
function twoChannels(at: { channel: number; index: number; value: number } | null = null): [Float64Array, Float64Array] {
  const ch: [Float64Array, Float64Array] = [new Float64Array(256), new Float64Array(256)];
  if (at) ch[at.channel]![at.index] = at.value;
  return ch;
}

let keys = 0;
const key = () => `hostile-${String(++keys).padStart(4, '0')}-${Date.now()}`;
const entryPath = () => `/api/campaigns/${rig.campaignId}/schedule/${rig.entries[0]!.id}/hits`;

function upload(file: Buffer, name: string, fields: Record<string, string> = {}, path = entryPath()) {
  let req = engineer.agent.post(path).set('idempotency-key', key());
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', file, name);
}

/** The one error shape, with the status and a message matching `message`. */
function expectRefusal(res: { status: number; body: unknown }, status: number, code: string, message: RegExp) {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.body).toEqual({ error: expect.objectContaining({ code, message: expect.any(String) }) });
  const error = (res.body as { error: { message: string } }).error;
  expect(Object.keys(error).filter((k) => !['code', 'message', 'details'].includes(k))).toEqual([]);
  expect(error.message).toMatch(message);
}

useBarRig(async (r) => {
  ({ app, lead, engineer, rig } = r);
  barPoints = await pointRows();
}, { HTTP_HEADERS_TIMEOUT_S: '1', HTTP_REQUEST_TIMEOUT_S: '2' }, { listen: true });

describe('values beyond any sensor are refused by channel, sample and value', () => {
  // Limits: 1000 × the settings' ranges (2000 N, 500 m/s²); sensitivities 2.25 mV/N and 10.2 mV/(m/s²) (tests/support/rig.ts).
  it('refuses 3e38 V in a float32 WAV (it overflows after the sensitivity), naming column, channel, sample and value', async () => {
    const res = await upload(encodeWav(twoChannels({ channel: 0, index: 99, value: 3e38 }), fs), 'huge.wav');
    expectRefusal(res, 400, 'value-out-of-range', /Column 1 of the file, ch1 \(hammer\), sample 100: 3e\+38 V, which is 1\.333e\+41 N with the sensitivity of 2\.25 mV\/N — beyond 1000 × the campaign's force range of 2000 N.*Nothing was stored/);
    expect(await hitRows()).toBe(0);
  });

  it('refuses 1e300 in a JSON recording and in a CSV (finite, but no float32 holds it after scaling)', async () => {
    const channels = twoChannels({ channel: 1, index: 7, value: 1e300 });
    const json = await upload(Buffer.from(JSON.stringify({ sampleRateHz: fs, channels: channels.map((c) => [...c]) })), 'huge.json');
    expectRefusal(json, 400, 'value-out-of-range', /Column 2 of the file, ch2 \(accelerometer at B21:\+Z\), sample 8: 1e\+300 V, which is 9\.804e\+301 m\/s² .* range of 500 m\/s²/);
    const csv = ['time,force,accel', ...Array.from({ length: 64 }, (_, i) => `${i / fs},${i === 30 ? '1e300' : '0'},0`)].join('\n');
    const fromCsv = await upload(Buffer.from(csv), 'huge.csv');
    expectRefusal(fromCsv, 400, 'value-out-of-range', /Column 1 of the file, ch1 \(hammer\), sample 31: 1e\+300 V/);
    expect(await hitRows()).toBe(0);
  });

  it('refuses an out-of-range value given in engineering units, and a float64 and an extensible float32 WAV alike', async () => {
    // 2.5e6 N > 1000 × 2000 N.
    const eu = await upload(encodeWav(twoChannels({ channel: 0, index: 0, value: 2.5e6 }), fs), 'eu.wav', { units: 'engineering' });
    expectRefusal(eu, 400, 'value-out-of-range', /sample 1: 2500000 N — beyond 1000 × the campaign's force range of 2000 N/);
    const f64 = await upload(encodeWav(twoChannels({ channel: 1, index: 255, value: -1e300 }), fs, 'float64'), 'f64.wav');
    expectRefusal(f64, 400, 'value-out-of-range', /ch2 \(accelerometer at B21:\+Z\), sample 256: -1e\+300 V/);
    const ext = await upload(encodeWav(twoChannels({ channel: 0, index: 3, value: 3e38 }), fs, 'float32', 1, { extensible: true }), 'ext.wav');
    expectRefusal(ext, 400, 'value-out-of-range', /ch1 \(hammer\), sample 4: 3e\+38 V/);
    expect(await hitRows()).toBe(0);
  });

  it('reads 32-bit PCM and extensible 24-bit PCM (values at most ±fullScaleVolts) and goes on to the trigger', async () => {
    // No hit in a quiet file: the answer is the 422 of the trigger, so decoding and conversion passed.
    for (const [format, extensible] of [['pcm32', false], ['pcm24', true]] as const) {
      const res = await upload(encodeWav(twoChannels(), fs, format, 10, { extensible }), `${format}.wav`, { fullScaleVolts: '10' });
      expectRefusal(res, 422, 'no-hit', /never reached the trigger level of 5 N/);
    }
    expect(await hitRows()).toBe(0);
  });

  it('refuses the same values in a background-noise upload, storing no noise check', async () => {
    const res = await upload(encodeWav(twoChannels({ channel: 1, index: 10, value: 3e38 }), fs), 'noise.wav', {}, `/api/campaigns/${rig.campaignId}/noise-checks`);
    expectRefusal(res, 400, 'value-out-of-range', /ch2 \(accelerometer at B21:\+Z\), sample 11: 3e\+38 V/);
    expect(await noiseRows()).toBe(0);
  });
});

describe('lying WAV headers are refused with the numbers', () => {
  it('refuses an extensible-format WAV whose 40-byte fmt chunk is cut off, saying how many bytes remain', async () => {
    const whole = encodeWav(twoChannels(), fs, 'float32', 1, { extensible: true });
    const res = await upload(whole.subarray(0, 12 + 8 + 30), 'cut.wav');
    expectRefusal(res, 400, 'bad-recording', /fmt chunk is truncated: it announces 40 bytes but only 30 remain in the file/);
    expect(await hitRows()).toBe(0);
  });

  it('refuses a fmt chunk announcing more bytes than the file has (not "no data chunk")', async () => {
    const wav = Buffer.from(encodeWav(twoChannels(), fs));
    wav.writeUInt32LE(0x7fff_0000, 16);
    const res = await upload(wav, 'lying.wav');
    expectRefusal(res, 400, 'bad-recording', new RegExp(`fmt chunk is truncated: it announces ${0x7fff_0000} bytes but only ${wav.length - 20} remain`));
    expect(res.body.error.message).not.toMatch(/no data chunk/);
    expect(await hitRows()).toBe(0);
  });

  it('refuses a header whose block alignment contradicts its channels and bits', async () => {
    const wav = Buffer.from(encodeWav(twoChannels(), fs));
    wav.writeUInt16LE(3, 32);
    expectRefusal(await upload(wav, 'align.wav'), 400, 'bad-recording', /block align 3 bytes, but 2 channels × 4 bytes make 8/);
  });
});

describe('CSV cells must be plain decimal numbers', () => {
  const recording = (cell: string) => ['time,force,accel', '0,0,0', `${1 / fs},${cell},0`, `${2 / fs},0,0`].join('\n');

  it.each([
    ['0x10', /"0x10" is not a decimal number/],
    ['Infinity', /"Infinity" is not a decimal number/],
    ['1e999', /"1e999" is beyond the range of a number/],
    ['', /is empty/],
    ['0b11', /"0b11" is not a decimal number/],
  ])('refuses %j in a recording, naming line and column', async (cell, reason) => {
    const res = await upload(Buffer.from(recording(cell)), 'cells.csv');
    expectRefusal(res, 400, 'bad-recording', new RegExp(`Line 3, column 2 \\("force"\\): the value ${reason.source}`));
    expect(await hitRows()).toBe(0);
  });

  it.each([
    ['0x10', /line 3: column 3 \(y, mm\): the value "0x10" is not a decimal number/],
    ['Infinity', /line 3: column 3 \(y, mm\): the value "Infinity" is not a decimal number/],
    ['1e999', /line 3: column 3 \(y, mm\): the value "1e999" is beyond the range of a number/],
    ['  ', /line 3: column 3 \(y, mm\): the value is empty/],
  ])('refuses %j in a geometry CSV, naming line and column, and imports nothing', async (cell, message) => {
    const csv = ['label,x,y,z', 'Q01,0,0,0', `Q02,10,${cell},0`].join('\n');
    const res = await lead.agent.post(`/api/campaigns/${rig.campaignId}/geometry/import`).send({ csv, mode: 'merge' });
    expectRefusal(res, 400, 'invalid-csv', message);
    expect(res.body.error.details[0].line).toBe(3);
    expect(await pointRows()).toBe(barPoints); // the bar's points from tests/support/rig.ts, none added
  });
});

describe('number fields of an upload form are plain decimal numbers too', () => {
  it.each(['0x1000', 'Infinity', ' ', '1e400'])('refuses sampleRateHz %j for a CSV without a time column', async (rate) => {
    const res = await upload(Buffer.from('force,accel\n0,0\n0,0\n'), 'norate.csv', { sampleRateHz: rate });
    expectRefusal(res, 400, 'bad-request', /^sampleRateHz: (must be a plain decimal number|is beyond the range of a number)/);
    expect(await hitRows()).toBe(0);
  });
});

describe('binary files are not read as CSV', () => {
  it('says a WAV uploaded as .csv is not a text CSV, without echoing its bytes', async () => {
    const res = await upload(encodeWav(twoChannels({ channel: 0, index: 0, value: 0.5 }), fs), 'oops.csv');
    expectRefusal(res, 400, 'bad-recording', /This is not a text CSV: the file holds binary bytes/);
    expect(res.body.error.message).not.toMatch(/RIFF|[\u0000-\u0008]/);
    expect(await hitRows()).toBe(0);
  });

  it('says the same for a binary geometry CSV', async () => {
    const res = await lead.agent
      .post(`/api/campaigns/${rig.campaignId}/geometry/import`)
      .field('mode', 'merge')
      .attach('file', Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0, 8, 0, 0x21, 0x6c]), { filename: 'points.csv', contentType: 'text/csv' });
    expectRefusal(res, 400, 'invalid-csv', /This is not a text CSV/);
    expect(await pointRows()).toBe(barPoints);
  });

  it('quotes at most 40 printable characters of a strange column name', async () => {
    const name = `\u0007${'x'.repeat(200)}`;
    const res = await upload(Buffer.from(`time,${name},accel\n0,0,0\n${1 / fs},zero,0\n`), 'names.csv');
    expectRefusal(res, 400, 'bad-recording', /column 2 \("\?x{39}…"\): the value "zero" is not a decimal number/);
  });
});

describe('a multipart body cut off before its end', () => {
  it('is answered "the upload was cut off" in the one shape, not with the parser\'s words', async () => {
    const boundary = 'resonote-cut-boundary';
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.wav"\r\nContent-Type: audio/wav\r\n\r\n`;
    // The body ends inside the file part: no closing boundary.
    const body = Buffer.concat([Buffer.from(head), encodeWav(twoChannels(), fs).subarray(0, 300)]);
    const res = await engineer.agent.post(entryPath()).set('idempotency-key', key()).set('content-type', `multipart/form-data; boundary=${boundary}`).send(body);
    expectRefusal(res, 400, 'upload-cut-off', /The upload was cut off before it ended .*send it again\. Nothing was stored\./);
    expect(res.body.error.message).not.toMatch(/Unexpected end of form/);
    expect(await hitRows()).toBe(0);
  });
});

describe('a backup with a row that does not fit', () => {
  it('is refused by name (a timestamp that is no time was a 500 found by the fuzz run), restoring nothing', async () => {
    const backup = await lead.agent.get(`/api/campaigns/${rig.campaignId}/backup`).buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });
    expect(backup.status).toBe(200);
    const files = unzipSync(new Uint8Array(backup.body as Buffer));
    const points = JSON.parse(Buffer.from(files['tables/point.json']!).toString('utf8')) as Record<string, unknown>[];
    points[0]!.createdAt = 'the day before yesterday';
    files['tables/point.json'] = strToU8(JSON.stringify(points));
    const [before] = await app.handle.database.db.select({ n: count() }).from(campaign);
    const res = await lead.agent.post('/api/campaigns/restore').attach('file', Buffer.from(zipSync(files)), 'edited.zip');
    expectRefusal(res, 400, 'backup-corrupt', /tables\/point\.json has a createdAt that is not a timestamp \("the day before yesterday"\)\. Nothing was restored\./);
    const [after] = await app.handle.database.db.select({ n: count() }).from(campaign);
    expect(after!.n).toBe(before!.n);
  });
});

/**
 * Writes raw HTTP on one socket and collects what comes back until the server closes it, `untilText`
 * appears, or 10 s pass with neither (`hung`: the server neither answered nor closed).
 */
function rawExchange(write: (socket: net.Socket) => void, untilText?: RegExp): Promise<{ text: string; closed: boolean; hung: boolean }> {
  const url = new URL(app.baseUrl);
  return new Promise((resolve, reject) => {
    const socket = net.connect(Number(url.port), url.hostname);
    let text = '';
    const finish = (closed: boolean, hung: boolean) => {
      clearTimeout(deadline);
      socket.destroy();
      resolve({ text, closed, hung });
    };
    const deadline = setTimeout(() => finish(false, true), 10_000);
    socket.on('data', (d) => {
      text += d.toString('latin1');
      if (untilText?.test(text)) finish(false, false);
    });
    socket.on('close', () => finish(true, false));
    socket.on('error', reject);
    socket.on('connect', () => write(socket));
  });
}

describe('an oversized body to /api/auth on a keep-alive connection', () => {
  const host = () => new URL(app.baseUrl).host;

  it.each([70 * 1024, 200 * 1024, 1024 * 1024])('gets 413 in the one shape for %i bytes, then the connection serves the next request or closes, never hangs', async (size) => {
    const big = JSON.stringify({ email: 'someone@lab.test', password: 'x'.repeat(size) });
    const first = `POST /api/auth/sign-in/email HTTP/1.1\r\nHost: ${host()}\r\nOrigin: ${app.origin}\r\nContent-Type: application/json\r\nContent-Length: ${Buffer.byteLength(big)}\r\nConnection: keep-alive\r\n\r\n`;
    const second = `GET /api/health HTTP/1.1\r\nHost: ${host()}\r\nConnection: keep-alive\r\n\r\n`;
    // The headers, then the body, then the next request on the same socket.
    const { text, closed, hung } = await rawExchange(
      (s) => {
        s.write(first);
        s.write(big, () => s.writable && s.write(second));
      },
      /HTTP\/1\.1 413[\s\S]*HTTP\/1\.1 200[\s\S]*\r\n\r\n\{[^}]*\}/,
    );
    expect(hung).toBe(false);
    expect(text).toMatch(/^HTTP\/1\.1 413 /);
    const body = text.slice(text.indexOf('\r\n\r\n') + 4).split('HTTP/1.1')[0]!;
    expect(JSON.parse(body)).toEqual({ error: { code: 'too-large', message: `The request body is larger than the limit of ${64 * 1024} bytes.` } });
    if (closed) expect(text).toMatch(/connection: close/i);
  });

  it('lets a keep-alive client (node:http Agent) go on with its next request after the 413', async () => {
    const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
    const send = (method: string, path: string, body?: string) =>
      new Promise<{ status: number; text: string }>((resolve, reject) => {
        const req = http.request(`${app.baseUrl}${path}`, { method, agent, headers: { origin: app.origin, ...(body ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) } : {}) } }, (res) => {
          let text = '';
          res.on('data', (d) => (text += d));
          res.on('end', () => resolve({ status: res.statusCode!, text }));
        });
        req.setTimeout(10_000, () => req.destroy(new Error(`${method} ${path} was never answered`)));
        req.on('error', reject);
        req.end(body);
      });
    try {
      for (const size of [200 * 1024, 1024 * 1024]) {
        const refused = await send('POST', '/api/auth/sign-up/email', JSON.stringify({ name: 'x', email: 'big@lab.test', password: 'y'.repeat(size) }));
        expect(refused.status).toBe(413);
        expect(JSON.parse(refused.text).error.code).toBe('too-large');
        const next = await send('GET', '/api/health');
        expect(next.status).toBe(200);
      }
    } finally {
      agent.destroy();
    }
  });
});

describe('slow clients are cut off by the configured timeouts', () => {
  // This app listens with HTTP_HEADERS_TIMEOUT_S=1 and HTTP_REQUEST_TIMEOUT_S=2.
  it('answers 408 in the one shape and closes a connection that trickles its headers a byte at a time', async () => {
    let timer: ReturnType<typeof setInterval> | undefined;
    const { text, closed } = await rawExchange((s) => {
      s.write(`GET /api/health HTTP/1.1\r\nHost: ${new URL(app.baseUrl).host}\r\nX-Slow: `);
      timer = setInterval(() => s.writable && s.write('a'), 200);
    });
    clearInterval(timer);
    expect(closed).toBe(true);
    expect(text).toMatch(/^HTTP\/1\.1 408 /);
    expect(JSON.parse(text.slice(text.indexOf('\r\n\r\n') + 4)).error.code).toBe('request-timeout');
  });

  it('cuts off an upload whose body trickles in, storing nothing', async () => {
    let timer: ReturnType<typeof setInterval> | undefined;
    const cookie = (await signIn(engineer.email)).cookie;
    const boundary = 'resonote-slow-boundary';
    const body = Buffer.concat([Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="slow.wav"\r\nContent-Type: audio/wav\r\n\r\n`), encodeWav(twoChannels(), fs), Buffer.from(`\r\n--${boundary}--\r\n`)]);
    const { text, closed } = await rawExchange((s) => {
      s.write(`POST ${entryPath()} HTTP/1.1\r\nHost: ${new URL(app.baseUrl).host}\r\nOrigin: ${app.origin}\r\nCookie: ${cookie}\r\nIdempotency-Key: ${key()}\r\nContent-Type: multipart/form-data; boundary=${boundary}\r\nContent-Length: ${body.length}\r\n\r\n`);
      let sent = 0;
      timer = setInterval(() => s.writable && sent < body.length && s.write(body.subarray(sent, ++sent)), 100);
    });
    clearInterval(timer);
    expect(closed).toBe(true);
    expect(text).toMatch(/^HTTP\/1\.1 408 /);
    expect(await hitRows()).toBe(0);
  });
});

async function signIn(email: string): Promise<{ cookie: string }> {
  const res = await fetch(`${app.baseUrl}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin: app.origin }, body: JSON.stringify({ email, password: PASSWORD }) });
  expect(res.status).toBe(200);
  return { cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ') };
}
