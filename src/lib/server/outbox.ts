import { sql } from 'kysely';
import { db } from './db/index.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import { sendMail } from './mail.ts';

// Every e-mail goes through the outbox: written in the same transaction as the change it reports,
// then delivered by a dispatcher that retries with growing pauses while the mail server is down.
// Delivery is at least once: a process that dies mid-send may send that message again later.

export interface OutgoingMail {
  /** What the message is about, e.g. `review.published`; for the notifications list. */
  kind: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  /** A signed link that stops this kind of mail in one click (sent as List-Unsubscribe). */
  unsubscribeUrl?: string;
}

/** Queues a message; call inside the transaction of the change it reports, then wakeOutbox(). */
export async function queueMail(trx: DbOrTrx, m: OutgoingMail): Promise<void> {
  await trx
    .insertInto('mail_outbox')
    .values({
      kind: m.kind,
      to_address: m.to,
      subject: m.subject,
      text_body: m.text,
      html_body: m.html ?? null,
      unsubscribe_url: m.unsubscribeUrl ?? null,
    })
    .execute();
}

/** Pause before attempt n+1 after n failures: 15 s doubling, at most an hour. */
export function retryDelaySeconds(failures: number): number {
  return Math.min(3600, 15 * 2 ** Math.max(0, failures - 1));
}

/** A claimed message is retried by another pass if its sender vanished for this long. */
const CLAIM_SECONDS = 300;

export interface DeliveryPass {
  sent: number;
  failed: number;
}

/** Delivers up to `limit` due messages once. Safe to run from several processes at a time. */
export async function deliverDueMail(limit = 20): Promise<DeliveryPass> {
  const claimed = await sql<{
    id: string;
    to_address: string;
    subject: string;
    text_body: string;
    html_body: string | null;
    unsubscribe_url: string | null;
    attempts: number;
  }>`
    UPDATE mail_outbox SET status = 'sending', attempts = attempts + 1,
           next_attempt_at = now() + make_interval(secs => ${CLAIM_SECONDS})
     WHERE id IN (SELECT id FROM mail_outbox
                   WHERE status IN ('queued', 'failed', 'sending') AND next_attempt_at <= now()
                   ORDER BY next_attempt_at LIMIT ${limit} FOR UPDATE SKIP LOCKED)
    RETURNING id, to_address, subject, text_body, html_body, unsubscribe_url, attempts`.execute(
    db(),
  );
  const pass = { sent: 0, failed: 0 };
  for (const m of claimed.rows) {
    try {
      await sendMail({
        to: m.to_address,
        subject: m.subject,
        text: m.text_body,
        html: m.html_body ?? undefined,
        unsubscribeUrl: m.unsubscribe_url ?? undefined,
      });
      await db()
        .updateTable('mail_outbox')
        .set({ status: 'sent', sent_at: new Date(), last_error: null })
        .where('id', '=', m.id)
        .execute();
      pass.sent++;
    } catch (err) {
      await db()
        .updateTable('mail_outbox')
        .set({
          status: 'failed',
          last_error: (err instanceof Error ? err.message : String(err)).slice(0, 500),
          next_attempt_at: new Date(Date.now() + retryDelaySeconds(m.attempts) * 1000),
        })
        .where('id', '=', m.id)
        .execute();
      pass.failed++;
    }
  }
  return pass;
}

let timer: NodeJS.Timeout | undefined;
let running = false;
let again = false;

async function pass() {
  if (running) {
    again = true;
    return;
  }
  running = true;
  try {
    do {
      again = false;
      const r = await deliverDueMail().catch(() => ({ sent: 0, failed: 0 }));
      if (r.sent + r.failed === 20) again = true; // a full batch: more may be waiting
    } while (again);
  } finally {
    running = false;
  }
}

/** Starts the periodic delivery pass in this process (idempotent). */
export function startOutbox(intervalMs = 2_000): void {
  if (timer) return;
  timer = setInterval(() => void pass(), intervalMs);
  timer.unref();
  void pass();
}

/** Asks for a delivery pass soon (after the queuing transaction has committed). */
export function wakeOutbox(): void {
  startOutbox();
  setTimeout(() => void pass(), 20).unref();
}

/** Stops the periodic pass (tests). */
export function stopOutbox(): void {
  if (timer) clearInterval(timer);
  timer = undefined;
}
