import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema.ts';

export type DbOrTrx = Kysely<Database> | Transaction<Database>;

export interface AuditEvent {
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId: string;
  details?: Record<string, unknown>;
}

/** Appends one audit event; call it inside the transaction of the change it records. */
export async function insertAuditEvent(db: DbOrTrx, e: AuditEvent): Promise<void> {
  await db
    .insertInto('audit_events')
    .values({
      actor_id: e.actorId,
      action: e.action,
      subject_type: e.subjectType,
      subject_id: e.subjectId,
      details: JSON.stringify(e.details ?? {}),
    })
    .execute();
}
