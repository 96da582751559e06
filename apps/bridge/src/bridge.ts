// The watched-folder bridge (issue 16): acquisition programs that write one file per hit drop
// them in a folder; the bridge uploads each complete new file to the DOF its user has armed on
// Tap — or to the DOF its name gives through the lead's file-name pattern — and prints each
// verdict in words. A file's Idempotency-Key is the SHA-256 of its bytes, so a restarted bridge
// (or a copy of the same file) never stores a hit twice.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { dofKey, matchFileName } from '@resonote/contracts';
import { ApiError, BridgeClient, type ScheduleEntry, type UploadAnswer } from './client.ts';
import { Journal, JOURNAL_NAME } from './journal.ts';
import { SettleTracker } from './settle.ts';

export interface BridgeOptions {
  url: string;
  token: string;
  folder: string;
  /** How long size and mtime must stay unchanged before a file counts as complete, ms. */
  settleMs: number;
  /** Period of the folder scan that backs up fs.watch, ms. */
  scanMs: number;
  units: 'volts' | 'engineering';
  fullScaleVolts: number;
  /** Hz, for CSV files without a time column. */
  sampleRateHz?: number;
  log: (line: string) => void;
}

const RECORDING = /\.(wav|csv|json|txt)$/i;

/** Exit codes: 0 stopped, 2 bad start (options or token), 3 the server stopped accepting the token. */
export type BridgeExit = { code: 0 | 2 | 3; reason: string };

export class Bridge {
  private readonly client: BridgeClient;
  private readonly settle: SettleTracker;
  private journal!: Journal;
  private campaignId = '';
  private who = '';
  /** Last message printed per waiting file, so a waiting file is reported once per reason. */
  private readonly waiting = new Map<string, string>();
  private readonly hashes = new Map<string, { size: number; mtimeMs: number; sha256: string }>();
  private watcher: fs.FSWatcher | null = null;
  private timer: NodeJS.Timeout | null = null;
  private scanning = false;
  private again = false;
  private finish!: (exit: BridgeExit) => void;
  readonly done: Promise<BridgeExit>;

  constructor(private readonly o: BridgeOptions) {
    this.client = new BridgeClient(o.url.replace(/\/+$/, ''), o.token);
    this.settle = new SettleTracker(o.settleMs);
    this.done = new Promise((resolve) => (this.finish = resolve));
  }

  async start(): Promise<BridgeExit | null> {
    if (!fs.existsSync(this.o.folder) || !fs.statSync(this.o.folder).isDirectory()) return { code: 2, reason: `The folder ${this.o.folder} does not exist.` };
    try {
      const me = await this.client.whoAmI();
      this.campaignId = me.campaign.id;
      this.who = me.user.name;
      this.o.log(`Signed in as ${me.user.name} with the token "${me.token.name}" (${me.token.role}) for the campaign "${me.campaign.name}".`);
    } catch (err) {
      return { code: 2, reason: err instanceof ApiError ? `The server refused the token: ${err.message}` : `Cannot reach ${this.o.url}: ${(err as Error).message}` };
    }
    this.journal = new Journal(this.o.folder);
    this.o.log(`Watching ${path.resolve(this.o.folder)} (a file counts as complete after ${this.o.settleMs} ms without change; ${this.journal.size} file(s) already done in ${JOURNAL_NAME}).`);
    try {
      this.watcher = fs.watch(this.o.folder, () => this.kick());
      this.watcher.on('error', () => this.kick());
    } catch {
      // Some file systems cannot be watched; the periodic scan still finds every file.
    }
    this.timer = setInterval(() => this.kick(), this.o.scanMs);
    this.kick();
    return null;
  }

  stop(exit: BridgeExit = { code: 0, reason: 'stopped' }): void {
    this.watcher?.close();
    if (this.timer) clearInterval(this.timer);
    this.watcher = null;
    this.timer = null;
    this.finish(exit);
  }

  private kick(): void {
    if (this.scanning) {
      this.again = true;
      return;
    }
    this.scanning = true;
    this.scan()
      .catch((err) => this.o.log(`Scan failed: ${(err as Error).message}; trying again.`))
      .finally(() => {
        this.scanning = false;
        if (this.again && this.timer) {
          this.again = false;
          setImmediate(() => this.kick());
        }
      });
  }

  private tell(file: string, message: string): void {
    if (this.waiting.get(file) === message) return;
    this.waiting.set(file, message);
    this.o.log(`${file}: ${message}`);
  }

  private async scan(): Promise<void> {
    const names = fs.readdirSync(this.o.folder).filter((n) => !n.startsWith('.') && RECORDING.test(n)).sort();
    for (const name of names) {
      if (!this.timer) return;
      let stat: fs.Stats;
      try {
        stat = fs.statSync(path.join(this.o.folder, name));
      } catch {
        continue; // gone between readdir and stat
      }
      if (!stat.isFile() || !this.settle.settled(name, { size: stat.size, mtimeMs: stat.mtimeMs })) continue;
      const known = this.hashes.get(name);
      let bytes: Buffer | null = null;
      let sha256: string;
      if (known && known.size === stat.size && known.mtimeMs === stat.mtimeMs) sha256 = known.sha256;
      else {
        bytes = fs.readFileSync(path.join(this.o.folder, name));
        sha256 = createHash('sha256').update(bytes).digest('hex');
        this.hashes.set(name, { size: stat.size, mtimeMs: stat.mtimeMs, sha256 });
      }
      if (this.journal.has(name, sha256)) continue;
      await this.send(name, bytes ?? fs.readFileSync(path.join(this.o.folder, name)), sha256);
    }
  }

  /** Where a file goes: the DOF its name gives through the pattern, else the user's armed DOF. */
  private async target(name: string): Promise<{ entry: ScheduleEntry } | { wait: string }> {
    const settings = (await this.client.settings(this.campaignId)).current.settings;
    const pattern = settings.bridgeFilePattern ?? '';
    if (pattern) {
      const named = matchFileName(pattern, name);
      if (named) {
        const { entries } = await this.client.schedule(this.campaignId);
        const found = entries.find((e) => (!named.response || dofKey(e.responseDof) === dofKey(named.response)) && (!named.excitation || dofKey(e.excitationDof) === dofKey(named.excitation)));
        if (!found) {
          const asked = [named.response && `response ${named.response}`, named.excitation && `excitation ${named.excitation}`].filter(Boolean).join(', ');
          return { wait: `no schedule entry has ${asked} (named by the pattern ${pattern}); the file waits until the schedule has it or it is renamed.` };
        }
        return { entry: found };
      }
    }
    const { mine } = await this.client.arming(this.campaignId);
    if (!mine) {
      const why = pattern ? `its name does not fit the pattern ${pattern}, and` : '';
      return { wait: `${why} nothing is armed for ${this.who} on Tap; arm a DOF there and the file goes out.`.replace(/^ /, '').replace(/^and /, '') };
    }
    return { entry: { id: mine.entryId, responseDof: mine.responseDof, excitationDof: mine.excitationDof, status: '' } };
  }

  private async send(name: string, bytes: Buffer, sha256: string): Promise<void> {
    let where: Awaited<ReturnType<Bridge['target']>>;
    try {
      where = await this.target(name);
    } catch (err) {
      return this.failed(name, err);
    }
    if ('wait' in where) return this.tell(name, `waiting: ${where.wait.charAt(0).toUpperCase()}${where.wait.slice(1)}`);
    const { entry } = where;
    const label = `${entry.responseDof} / ${entry.excitationDof}`;
    const fields: Record<string, string> = { units: this.o.units, fullScaleVolts: String(this.o.fullScaleVolts) };
    if (this.o.sampleRateHz) fields.sampleRateHz = String(this.o.sampleRateHz);
    let answer: UploadAnswer;
    try {
      answer = await this.client.upload(this.campaignId, entry.id, { name, bytes }, fields, `bridge-sha256-${sha256}`);
    } catch (err) {
      if (err instanceof ApiError && [400, 413, 415, 422].includes(err.status)) {
        this.journal.add({ file: name, sha256, size: bytes.length, outcome: 'refused', entry: label, summary: err.message });
        this.waiting.delete(name);
        this.o.log(`${name} → ${label}: rejected: ${err.message}`);
        return;
      }
      return this.failed(name, err);
    }
    const verdicts = answer.hits.map((h) => (h.verdict === 'accept' ? `hit ${h.sequence} accepted` : `hit ${h.sequence} rejected (${h.reasons.map((r) => r.message).join('; ')})`));
    const parts = [
      answer.replayed ? `already stored earlier, not stored again (${verdicts.join(', ')})` : verdicts.join(', '),
      ...(answer.resampled ? [`resampled from ${answer.resampled.fromHz} Hz to ${answer.resampled.toHz} Hz`] : []),
      ...answer.skipped.map((s) => `skipped at ${s.timeS.toFixed(3)} s: ${s.reason}`),
      `${answer.entry.acceptedHits} accepted at this DOF, status ${answer.entry.status}`,
    ];
    const summary = parts.join('; ');
    this.journal.add({ file: name, sha256, size: bytes.length, outcome: 'sent', entry: label, summary });
    this.waiting.delete(name);
    this.o.log(`${name} → ${label}: ${summary}.`);
  }

  private failed(name: string, err: unknown): void {
    if (err instanceof ApiError && (err.status === 401 || (err.status === 403 && err.code.startsWith('token')))) {
      this.o.log(`${name}: the server refused the token: ${err.message} The file is left waiting; start the bridge again with a valid token.`);
      this.stop({ code: 3, reason: err.message });
      return;
    }
    if (err instanceof ApiError && err.status < 500) return this.tell(name, `waiting: ${err.message}`);
    const why = err instanceof ApiError ? err.message : `the server at ${this.o.url} cannot be reached (${(err as Error).message})`;
    this.tell(name, `waiting: ${why}; trying again.`);
  }
}
