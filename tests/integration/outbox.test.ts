import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startMailFake, type MailFake } from '../../scripts/lib/mail-fake.ts';
import { freePort } from '../../scripts/lib/services.ts';
import { readCapturedMail } from '#lib/server/mail-capture.ts';

// This file's process sends to a mail server of its own, which is down at first.
const port = await freePort();
process.env.SMTP_PORT = String(port);
const { db } = await import('#lib/server/db/index.ts');
const { deliverDueMail, queueMail, retryDelaySeconds } = await import('#lib/server/outbox.ts');

const dir = mkdtempSync(path.join(tmpdir(), 'edgewise-outbox-'));
let fake: MailFake | undefined;
afterAll(async () => {
  await fake?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('mail outbox', () => {
  it('keeps a message while the mail server is down and delivers it once it is back', async () => {
    const to = `outbox-${randomBytes(4).toString('hex')}@example.test`;
    await db()
      .transaction()
      .execute((trx) =>
        queueMail(trx, { kind: 'test.outbox', to, subject: 'Held back', text: 'body' }),
      );

    const down = await deliverDueMail();
    expect(down.failed).toBeGreaterThanOrEqual(1);
    const held = await db()
      .selectFrom('mail_outbox')
      .selectAll()
      .where('to_address', '=', to)
      .executeTakeFirstOrThrow();
    expect(held.status).toBe('failed');
    expect(held.attempts).toBe(1);
    expect(held.last_error).toBeTruthy();
    expect(held.next_attempt_at.getTime()).toBeGreaterThan(Date.now() + 10_000);

    // Not due yet: a pass now leaves it alone.
    fake = await startMailFake({ port, directory: dir });
    await deliverDueMail();
    expect(
      (
        await db()
          .selectFrom('mail_outbox')
          .select('status')
          .where('to_address', '=', to)
          .executeTakeFirstOrThrow()
      ).status,
    ).toBe('failed');

    // Time passes (the retry pause is over); the next pass delivers it.
    await db()
      .updateTable('mail_outbox')
      .set({ next_attempt_at: new Date(Date.now() - 1000) })
      .where('to_address', '=', to)
      .execute();
    const up = await deliverDueMail();
    expect(up.sent).toBeGreaterThanOrEqual(1);
    const sent = await db()
      .selectFrom('mail_outbox')
      .selectAll()
      .where('to_address', '=', to)
      .executeTakeFirstOrThrow();
    expect(sent.status).toBe('sent');
    expect(sent.attempts).toBe(2);
    expect(sent.sent_at).toBeInstanceOf(Date);
    const mails = (await readCapturedMail(dir)).filter((m) => m.to.includes(to));
    expect(mails).toHaveLength(1);
    expect(mails[0]!.subject).toBe('Held back');
  });

  it('a message queued in a transaction that rolls back is never sent', async () => {
    const to = `rollback-${randomBytes(4).toString('hex')}@example.test`;
    await expect(
      db()
        .transaction()
        .execute(async (trx) => {
          await queueMail(trx, { kind: 'test.outbox', to, subject: 'Never', text: 'x' });
          throw new Error('the change failed');
        }),
    ).rejects.toThrow('the change failed');
    expect(
      await db().selectFrom('mail_outbox').select('id').where('to_address', '=', to).execute(),
    ).toEqual([]);
  });

  it('backs off by doubling from 15 s up to an hour', () => {
    expect([1, 2, 3, 4, 20].map(retryDelaySeconds)).toEqual([15, 30, 60, 120, 3600]);
  });
});
