// The `.resonote-sent` journal in the watched folder: one JSON line per file the bridge is done
// with (sent, or refused for good). The acquisition program's files are never moved, changed or
// deleted; the journal is how a restarted bridge knows what it already did.
import fs from 'node:fs';
import path from 'node:path';

export const JOURNAL_NAME = '.resonote-sent';

export interface JournalLine {
  file: string;
  sha256: string;
  size: number;
  outcome: 'sent' | 'refused';
  /** "response / excitation" of the schedule entry, when it was sent. */
  entry?: string;
  summary: string;
  at: string;
}

export class Journal {
  private readonly done = new Map<string, JournalLine>();
  readonly path: string;

  constructor(folder: string) {
    this.path = path.join(folder, JOURNAL_NAME);
    if (!fs.existsSync(this.path)) return;
    for (const line of fs.readFileSync(this.path, 'utf8').split('\n')) {
      if (!line.trim()) continue;
      try {
        const row = JSON.parse(line) as JournalLine;
        if (row.file && row.sha256) this.done.set(this.key(row.file, row.sha256), row);
      } catch {
        // A line cut short by a crash while it was written: that file is simply looked at again
        // (its Idempotency-Key makes a second upload a replay).
      }
    }
  }

  private key(file: string, sha256: string) {
    return `${file}\u0000${sha256}`;
  }

  get size(): number {
    return this.done.size;
  }

  has(file: string, sha256: string): JournalLine | undefined {
    return this.done.get(this.key(file, sha256));
  }

  add(row: Omit<JournalLine, 'at'>): void {
    const line: JournalLine = { ...row, at: new Date().toISOString() };
    fs.appendFileSync(this.path, JSON.stringify(line) + '\n');
    this.done.set(this.key(row.file, row.sha256), line);
  }
}
