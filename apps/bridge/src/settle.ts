// A file written in pieces is complete only when it stops changing: its size and modification
// time must stay the same for the settle time before the bridge reads it.

export interface FileStamp {
  size: number;
  mtimeMs: number;
}

export class SettleTracker {
  private readonly seen = new Map<string, FileStamp & { since: number }>();
  constructor(private readonly settleMs: number) {}

  /** True once `name` has kept the same size and mtime for the settle time (and is not empty). */
  settled(name: string, stamp: FileStamp, now = Date.now()): boolean {
    const prev = this.seen.get(name);
    if (!prev || prev.size !== stamp.size || prev.mtimeMs !== stamp.mtimeMs) {
      this.seen.set(name, { ...stamp, since: now });
      return false;
    }
    return stamp.size > 0 && now - prev.since >= this.settleMs;
  }

  forget(name: string): void {
    this.seen.delete(name);
  }
}
