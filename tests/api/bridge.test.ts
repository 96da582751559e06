// The watched-folder bridge as a person runs it: a child process against a listening test app,
// a temporary folder that an "acquisition program" (this test) writes hit files into in pieces.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { hit } from '@resonote/db/schema';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { atRate, barHitsWav, simulateBarHits } from '../support/bar-hits.ts';
import { useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
let app: TestApp & { baseUrl: string };
let lead: Person;
let engineer: Person;
let rig: RigCampaign;
const fs0 = BAR_SETTINGS.sampleRateHz;
const entry = (excitation: string) => rig.entries.find((e) => e.excitationDof === excitation)!;
const hitsAt = async (excitation: string) => (await app.handle.database.db.select({ id: hit.id }).from(hit).where(eq(hit.scheduleEntryId, entry(excitation).id))).length;

/** Hits as volts in a float32 WAV (the rig's 2.25 mV/N hammer, 10.2 mV/(m/s²) accelerometer) at `rateHz`. */
const wav = (excitationDof: string, seed: number, count: number, rateHz: number = fs0) => barHitsWav(rig, simulateBarHits(excitationDof, count, seed, atRate(rateHz)), 'float32', rateHz);

/** Writes a file in eight pieces, each appended only after the bridge could have looked at the last. */
async function writeInPieces(file: string, bytes: Buffer) {
  const piece = Math.ceil(bytes.length / 8);
  for (let i = 0; i < bytes.length; i += piece) {
    fs.appendFileSync(file, bytes.subarray(i, i + piece));
    // A pause shorter than the bridge's settle time (600 ms) but longer than its scan (50 ms):
    // the bridge sees a growing file several times and must wait for it.
    await new Promise((r) => setTimeout(r, 120));
  }
}

class RunningBridge {
  readonly lines: string[] = [];
  readonly exited: Promise<number | null>;
  private waiters: (() => void)[] = [];
  readonly child: ChildProcess;
  constructor(folder: string, token: string) {
    this.child = spawn(process.execPath, ['--import', 'tsx', 'apps/bridge/src/main.ts', '--url', app.baseUrl, '--token', token, '--folder', folder, '--settle-ms', '600', '--scan-ms', '50'], { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] });
    let buf = '';
    const take = (chunk: Buffer) => {
      buf += chunk.toString();
      const parts = buf.split('\n');
      buf = parts.pop()!;
      this.lines.push(...parts);
      for (const w of this.waiters.splice(0)) w();
    };
    this.child.stdout!.on('data', take);
    this.child.stderr!.on('data', take);
    this.exited = new Promise((resolve) => this.child.on('exit', (code) => {
      for (const w of this.waiters.splice(0)) w();
      resolve(code);
    }));
  }
  /** Waits for an output line matching `re` (the bridge's state), failing after 60 s with what it printed. */
  async line(re: RegExp): Promise<string> {
    const deadline = Date.now() + 60_000;
    for (;;) {
      const found = this.lines.find((l) => re.test(l));
      if (found) return found;
      if (Date.now() > deadline || this.child.exitCode !== null) throw new Error(`no line matching ${re}; the bridge printed:\n${this.lines.join('\n')}`);
      await new Promise<void>((r) => {
        this.waiters.push(r);
        setTimeout(r, 1000);
      });
    }
  }
  stop() {
    if (this.child.exitCode === null) this.child.kill('SIGTERM');
    return this.exited;
  }
}

let folder: string;
let token: { id: string; secret: string };

useBarRig(async (r) => {
  ({ app, lead, engineer, rig } = r);
  folder = fs.mkdtempSync(path.join(os.tmpdir(), 'resonote-bridge-'));
  const made = await engineer.agent.post('/api/account/tokens').send({ name: 'bridge test', campaignId: rig.campaignId });
  token = { id: made.body.token.id, secret: made.body.secret };
}, { UPLOAD_LIMIT_MB: '8' }, { listen: true });
afterAll(async () => {
  if (folder) fs.rmSync(folder, { recursive: true, force: true });
});

describe('the watched-folder bridge', () => {
  it('uploads complete files once each, names the reason a file waits or is refused, and stops on a revoked token', async () => {
    const bridge = new RunningBridge(folder, token.secret);
    try {
      await bridge.line(/Signed in as Eric Engineer with the token "bridge test" \(engineer\)/);
      await bridge.line(/Watching .* 0 file\(s\) already done/);

      // Nothing armed: the file waits, untouched.
      await writeInPieces(path.join(folder, 'take-001.wav'), wav('B05:+Z', 5, 2));
      await bridge.line(/take-001\.wav: waiting: Nothing is armed for Eric Engineer on Tap/);
      expect(await hitsAt('B05:+Z')).toBe(0);

      // Armed on Tap: the waiting file goes out, to the armed DOF.
      await engineer.agent.put(`/api/campaigns/${rig.campaignId}/arming`).send({ entryId: entry('B05:+Z').id }).expect(200);
      await bridge.line(/take-001\.wav → B21:\+Z \/ B05:\+Z: hit 1 accepted, hit 2 accepted/);
      expect(await hitsAt('B05:+Z')).toBe(2);

      // The lead's pattern names the DOF in the file name; an unknown DOF waits with a message.
      const current = (await lead.agent.get(`/api/campaigns/${rig.campaignId}/settings`)).body.current;
      await lead.agent.put(`/api/campaigns/${rig.campaignId}/settings`).send({ baseVersion: current.version, settings: { ...current.settings, bridgeFilePattern: '{response}_{excitation}_*.wav' }, reason: 'file names carry the DOF' }).expect(200);
      await writeInPieces(path.join(folder, 'B21+Z_B07+Z_001.wav'), wav('B07:+Z', 7, 1));
      await bridge.line(/B21\+Z_B07\+Z_001\.wav → B21:\+Z \/ B07:\+Z: hit 1 accepted/);
      await writeInPieces(path.join(folder, 'B21+Z_X99+Z_001.wav'), wav('B07:+Z', 8, 1));
      await bridge.line(/B21\+Z_X99\+Z_001\.wav: waiting: No schedule entry has response B21\+Z, excitation X99\+Z/);

      // Another sample rate, resampling not allowed: refused with the server's reason, done with.
      await writeInPieces(path.join(folder, 'take-48k.wav'), wav('B05:+Z', 9, 1, 3 * fs0));
      await bridge.line(/take-48k\.wav → B21:\+Z \/ B05:\+Z: rejected: The recording is sampled at 12288 Hz but the campaign's settings ask for 4096 Hz/);

      // The token is revoked mid-run: the next file is refused with the server's words and the bridge stops.
      await engineer.agent.delete(`/api/account/tokens/${token.id}`).expect(200);
      await writeInPieces(path.join(folder, 'take-002.wav'), wav('B05:+Z', 10, 1));
      await bridge.line(/the server refused the token: This API token \("bridge test"\) was revoked on/);
      expect(await bridge.exited).toBe(3);
    } finally {
      await bridge.stop();
    }
    // Each hit once: 2 at B05 (take-001), 1 at B07; nothing from the refused, waiting or late files.
    expect(await hitsAt('B05:+Z')).toBe(2);
    expect(await hitsAt('B07:+Z')).toBe(1);
    const journal = fs.readFileSync(path.join(folder, '.resonote-sent'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as { file: string; outcome: string });
    expect(journal.map((j) => [j.file, j.outcome])).toEqual([
      ['take-001.wav', 'sent'],
      ['B21+Z_B07+Z_001.wav', 'sent'],
      ['take-48k.wav', 'refused'],
    ]);
    // The acquisition program's files are all still there, unchanged in number.
    expect(fs.readdirSync(folder).filter((f) => f.endsWith('.wav')).length).toBe(5);
  }, 120_000);

  it('never stores a file twice after a restart: the journal skips it, and a copy elsewhere is a replay', async () => {
    const made = await engineer.agent.post('/api/account/tokens').send({ name: 'bridge again', campaignId: rig.campaignId });
    const second = fs.mkdtempSync(path.join(os.tmpdir(), 'resonote-bridge-copy-'));
    fs.copyFileSync(path.join(folder, 'take-001.wav'), path.join(second, 'take-001-copy.wav'));
    const again = new RunningBridge(folder, made.body.secret);
    const copy = new RunningBridge(second, made.body.secret);
    try {
      await again.line(/3 file\(s\) already done/);
      // take-002 (left waiting by the revoked token) now goes out; take-001 is not sent again.
      await again.line(/take-002\.wav → B21:\+Z \/ B05:\+Z: hit 3 accepted/);
      await copy.line(/take-001-copy\.wav → B21:\+Z \/ B05:\+Z: already stored earlier, not stored again/);
    } finally {
      await again.stop();
      await copy.stop();
      fs.rmSync(second, { recursive: true, force: true });
    }
    expect(again.lines.some((l) => l.includes('take-001.wav →'))).toBe(false);
    expect(await hitsAt('B05:+Z')).toBe(3);
  }, 120_000);
});
