import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { sendMail } from '#lib/server/mail.ts';
import { waitForMail } from '../helpers.ts';

describe('mail through nodemailer to the local SMTP fake', () => {
  it('delivers a message that the tests can read back, decoded', async () => {
    const to = `reader-${randomBytes(4).toString('hex')}@example.test`;
    // A long line with "=" forces quoted-printable encoding; the reader must undo it.
    const link = `http://localhost/confirm?token=${'ab'.repeat(60)}&next=/windows`;
    await sendMail({ to, subject: 'Confirm your address', text: `Open this link:\n${link}\n` });
    const mail = await waitForMail(to, /Confirm/);
    expect(mail.text).toContain(link);
    expect(mail.from).toContain('no-reply@edgewise.test');
  });
});
