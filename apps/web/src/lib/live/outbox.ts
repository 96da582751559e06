// Captured hits waiting to be sent, kept in IndexedDB so a hit survives a dropped network, a
// server restart or a reload of the page. Each entry carries the Idempotency-Key made at capture,
// so sending it again never stores it twice; entries go out in capture order (docs/decisions/live-capture.md).
const DB_NAME = 'resonote-live';
const STORE = 'outbox';

export interface OutboxItem {
  /** Auto-increment: capture order. */
  id?: number;
  key: string;
  campaignId: string;
  entryId: string;
  entryLabel: string;
  capturedAt: number;
  sampleRateHz: number;
  /** Float32 WAV of volts, as it will be uploaded. */
  wav: ArrayBuffer;
  /** Set when the server refused it for good (a 4xx): kept, shown, not sent again. */
  refused?: string;
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => {
      const store = req.result.createObjectStore(STORE, { keyPath: 'id', autoIncrement: true });
      store.createIndex('campaign', 'campaignId');
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('IndexedDB could not be opened'));
  });
}

async function tx<T>(mode: IDBTransactionMode, run: (store: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await open();
  try {
    return await new Promise<T>((resolve, reject) => {
      const t = db.transaction(STORE, mode);
      const req = run(t.objectStore(STORE));
      t.oncomplete = () => resolve(req.result);
      t.onerror = () => reject(t.error ?? new Error('IndexedDB transaction failed'));
      t.onabort = () => reject(t.error ?? new Error('IndexedDB transaction aborted'));
    });
  } finally {
    db.close();
  }
}

/** Stores a captured hit; resolves once it is on disk (the transaction completed). */
export async function keep(item: OutboxItem): Promise<number> {
  return (await tx('readwrite', (s) => s.add(item))) as number;
}

/** The campaign's waiting hits in capture order. */
export async function waiting(campaignId: string): Promise<OutboxItem[]> {
  const all = await tx<OutboxItem[]>('readonly', (s) => s.index('campaign').getAll(campaignId) as IDBRequest<OutboxItem[]>);
  return all.sort((a, b) => a.id! - b.id!);
}

export async function drop(id: number): Promise<void> {
  await tx('readwrite', (s) => s.delete(id));
}

export async function markRefused(item: OutboxItem, message: string): Promise<void> {
  await tx('readwrite', (s) => s.put({ ...item, refused: message }));
}
