import type { z } from 'zod';
import type { Db } from './db/index.ts';
import { authorize, requireUser, type Principal } from './policy.ts';
import { listAuditEvents, mailTo, type AuditFilter } from './repositories/curation.ts';
import { findUserByEmail, isUuid } from './repositories/users.ts';
import type {
  AuditEventView,
  NotificationView,
  auditQuery,
  notificationsQuery,
} from '../shared/curation.ts';

// Reading what happened: the audit log (curators and admins) and a user's own notifications
// (the messages the outbox holds for their address).

/** Audit events filtered by actor (id or e-mail), record, action (or a prefix ending in "."), and dates; newest first. */
export async function auditLog(
  db: Db,
  principal: Principal,
  q: z.output<typeof auditQuery>,
): Promise<{ total: number; limit: number; offset: number; items: AuditEventView[] }> {
  authorize(principal, 'audit.read', null);
  const f: AuditFilter = {};
  if (q.actor) {
    const id = isUuid(q.actor) ? q.actor : (await findUserByEmail(db, q.actor))?.id;
    // An unknown actor matches nothing (rather than everything).
    if (!id) return { total: 0, limit: q.limit, offset: q.offset, items: [] };
    f.actorId = id;
  }
  if (q.record) f.subjectId = q.record;
  if (q.action) {
    if (q.action.endsWith('.')) f.actionPrefix = q.action;
    else f.action = q.action;
  }
  if (q.from) f.from = q.from;
  if (q.to) f.to = q.to;
  const { rows, total } = await listAuditEvents(db, f, { limit: q.limit, offset: q.offset });
  return {
    total,
    limit: q.limit,
    offset: q.offset,
    items: rows.map((r) => ({
      id: String(r.id),
      at: r.at.toISOString(),
      actor: r.actor_id ? { id: r.actor_id, name: r.actor_name, email: r.actor_email ?? '' } : null,
      action: r.action,
      subjectType: r.subject_type,
      subjectId: r.subject_id,
      details: r.details,
    })),
  };
}

/** Kinds of message shown as notifications (account e-mails with sign-in links are left out). */
export const NOTIFICATION_KINDS = ['review.', 'flag.', 'vocabulary.'] as const;

/** The signed-in user's notifications, newest first. */
export async function listNotifications(
  db: Db,
  principal: Principal,
  q: z.output<typeof notificationsQuery>,
): Promise<{ total: number; items: NotificationView[] }> {
  authorize(principal, 'notification.list', null);
  const user = requireUser(principal);
  const { rows, total } = await mailTo(db, user.email, NOTIFICATION_KINDS, {
    limit: q.limit,
    offset: q.offset,
  });
  return {
    total,
    items: rows.map((r) => ({
      id: r.id,
      kind: r.kind,
      subject: r.subject,
      text: r.text_body,
      createdAt: r.created_at.toISOString(),
      delivered: r.status === 'sent',
    })),
  };
}
