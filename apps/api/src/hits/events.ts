// Change notices per campaign, pushed to open Server-Sent-Events streams so other members see a
// new hit, verdict or schedule change within a second (issue 5) — on whichever API process they
// are connected to (issue 18). Every publish is a PostgreSQL NOTIFY on one channel; every process
// LISTENs on a dedicated connection and hands what arrives to its local subscribers. A notice
// carries ids only (NOTIFY payloads stop at 8000 bytes); a client reads the rows it needs.
// See docs/decisions/0008-events-listen-notify.md.
import { EventEmitter } from 'node:events';
import pg from 'pg';

export interface CampaignEvent {
  type: 'hit' | 'verdict' | 'schedule' | 'arming' | 'job';
  entryId?: string;
  jobId?: string;
  /** The hits a hit or verdict notice is about, as "id:version", so the tab that made the change can tell its own notice. */
  hits?: string[];
  at: string;
  /** Set on the notice sent after the listener reconnected: something may have been missed. */
  resync?: true;
}

export const EVENTS_CHANNEL = 'resonote_campaign_events';

/** The pieces of the pool a publisher needs (a pg.Pool or a Drizzle db's $client). */
export interface Queryable {
  query(text: string, values: unknown[]): Promise<unknown>;
}

export class CampaignEvents {
  private readonly emitter = new EventEmitter();
  private client: pg.Client | null = null;
  private closed = false;
  private retryMs = 250;
  private reconnectTimer: ReturnType<typeof setTimeout> | null = null;
  private readyWaiters: (() => void)[] = [];
  private listening = false;
  private everListened = false;

  /**
   * @param publisher where NOTIFY is sent (the app's pool)
   * @param databaseUrl the database to LISTEN on; without it the instance only publishes (workers)
   */
  constructor(
    private readonly publisher: Queryable,
    private readonly databaseUrl?: string,
    private readonly log: (message: string) => void = (m) => console.warn(m),
  ) {
    this.emitter.setMaxListeners(0);
  }

  /** Connects the listener; resolves once LISTEN is in place. */
  async start(): Promise<void> {
    if (!this.databaseUrl) return;
    await this.connect();
  }

  /** Resolves when the listener is (again) in place — tests use it after a forced reconnect. */
  ready(): Promise<void> {
    if (this.listening || !this.databaseUrl) return Promise.resolve();
    return new Promise((resolve) => this.readyWaiters.push(resolve));
  }

  private async connect(): Promise<void> {
    const client = new pg.Client({ connectionString: this.databaseUrl, application_name: 'resonote-events' });
    this.client = client;
    let failed = false;
    const lost = (why: string) => {
      if (failed) return;
      failed = true;
      this.listening = false;
      if (this.client === client) this.client = null;
      client.removeAllListeners('notification');
      void client.end().catch(() => undefined);
      if (this.closed) return;
      this.log(`[resonote] event listener lost its connection (${why}); reconnecting in ${this.retryMs} ms`);
      this.reconnectTimer = setTimeout(() => {
        this.reconnectTimer = null;
        void this.connect().catch(() => undefined);
      }, this.retryMs);
      this.reconnectTimer.unref?.();
      this.retryMs = Math.min(this.retryMs * 2, 5000);
    };
    client.on('error', (err) => lost(err.message));
    client.on('end', () => lost('connection closed'));
    client.on('notification', (n) => {
      if (n.channel !== EVENTS_CHANNEL || !n.payload) return;
      try {
        const { c, ...event } = JSON.parse(n.payload) as CampaignEvent & { c: string };
        this.emitter.emit(c, event);
      } catch {
        // A payload this code did not write; nothing to deliver.
      }
    });
    try {
      await client.connect();
      await client.query(`LISTEN ${EVENTS_CHANNEL}`);
    } catch (err) {
      if (!this.everListened) {
        // The first connection is made at start: fail the start rather than retry in the dark.
        failed = true;
        this.client = null;
        void client.end().catch(() => undefined);
        throw err;
      }
      lost((err as Error).message);
      return;
    }
    const reconnected = this.everListened;
    this.everListened = true;
    this.listening = true;
    this.retryMs = 250;
    this.readyWaiters.splice(0).forEach((r) => r());
    // Whatever was published while the listener was away is gone: tell every open stream to
    // re-read (the Tap and Review pages refetch on any notice).
    if (reconnected) for (const name of this.emitter.eventNames()) this.emitter.emit(name, { type: 'schedule', at: new Date().toISOString(), resync: true } satisfies CampaignEvent);
  }

  /** Tells every process's subscribers of the campaign; never throws (a lost notice is not lost data). */
  async publish(campaignId: string, event: Omit<CampaignEvent, 'at'>): Promise<void> {
    const payload = JSON.stringify({ c: campaignId, ...event, at: new Date().toISOString() });
    try {
      await this.publisher.query('SELECT pg_notify($1, $2)', [EVENTS_CHANNEL, payload]);
    } catch (err) {
      this.log(`[resonote] could not publish a campaign event: ${(err as Error).message}`);
    }
  }

  subscribe(campaignId: string, listener: (e: CampaignEvent) => void): () => void {
    this.emitter.on(campaignId, listener);
    return () => this.emitter.off(campaignId, listener);
  }

  /** Drops the listener's connection as a network fault would (tests of the re-LISTEN path). */
  dropConnectionForTest(): void {
    this.client?.emit('error', new Error('dropped by a test'));
  }

  async close(): Promise<void> {
    this.closed = true;
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    const client = this.client;
    this.client = null;
    this.listening = false;
    if (client) {
      client.removeAllListeners('end');
      await client.end().catch(() => undefined);
    }
  }
}
