// Writes one audit event: who changed what, when, with the state before and after.
import { auditEvent } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface AuditInput {
  campaignId: string | null;
  actorId: string | null;
  entity: string;
  entityId: string;
  action: string;
  before?: unknown;
  after?: unknown;
}

export async function audit(db: Db | Tx, event: AuditInput): Promise<void> {
  await db.insert(auditEvent).values({
    campaignId: event.campaignId,
    actorId: event.actorId,
    entity: event.entity,
    entityId: event.entityId,
    action: event.action,
    before: event.before === undefined ? null : (JSON.parse(JSON.stringify(event.before)) as unknown),
    after: event.after === undefined ? null : (JSON.parse(JSON.stringify(event.after)) as unknown),
  });
}

export type { Tx };
