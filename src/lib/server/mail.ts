import nodemailer, { type Transporter } from 'nodemailer';
import { config } from './config.ts';

// The only place that sends e-mail: nodemailer over SMTP, to a local sink in development.

let transport: Transporter | undefined;

function mailer(): Transporter {
  const c = config();
  transport ??= nodemailer.createTransport({
    host: c.SMTP_HOST,
    port: c.SMTP_PORT,
    secure: false,
    ignoreTLS: c.APP_ENV !== 'production',
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
  });
  return transport;
}

export interface Message {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /** Sent as List-Unsubscribe with List-Unsubscribe-Post: One-Click (RFC 8058). */
  unsubscribeUrl?: string;
}

/** Sends one message; rejects when the mail server cannot take it. */
export async function sendMail({ unsubscribeUrl, ...message }: Message): Promise<void> {
  await mailer().sendMail({
    from: config().MAIL_FROM,
    ...message,
    ...(unsubscribeUrl
      ? {
          list: { unsubscribe: unsubscribeUrl },
          headers: { 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' },
        }
      : {}),
  });
}

/** True when the SMTP server answers a handshake. */
export async function pingMail(): Promise<boolean> {
  try {
    await Promise.race([
      mailer().verify(),
      new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 2_000)),
    ]);
    return true;
  } catch {
    return false;
  }
}
