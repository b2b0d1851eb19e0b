// A local SMTP sink: accepts every message on loopback and keeps it as an .eml file, where the
// tests read it and the development mail page lists it. Nothing leaves the machine.
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

export interface MailFake {
  port: number;
  directory: string;
  close(): Promise<void>;
}

let counter = 0;

/** Starts the sink on 127.0.0.1 (port 0 picks a free one). */
export async function startMailFake(opts: { port: number; directory: string }): Promise<MailFake> {
  mkdirSync(opts.directory, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const name = `${Date.now()}-${process.pid}-${String(++counter).padStart(5, '0')}.eml`;
        writeFileSync(path.join(opts.directory, name), Buffer.concat(chunks));
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return {
    port,
    directory: opts.directory,
    close: () => new Promise((r) => server.close(() => r())),
  };
}
