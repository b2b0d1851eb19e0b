import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';

// Reads the messages the local SMTP fake captured (development page and tests only).

export interface CapturedMail {
  id: string;
  date: Date;
  from: string;
  to: string;
  subject: string;
  text: string;
  /** Header lines by lower-case name, values as sent (unfolded). */
  headers: Record<string, string>;
}

/** Captured messages, newest first, decoded (quoted-printable and all). */
export async function readCapturedMail(directory: string): Promise<CapturedMail[]> {
  let files: string[];
  try {
    files = (await fs.readdir(directory)).filter((f) => f.endsWith('.eml'));
  } catch {
    return [];
  }
  files.sort().reverse();
  return Promise.all(
    files.map(async (file) => {
      const parsed = await simpleParser(await fs.readFile(path.join(directory, file)));
      const addr = (a: typeof parsed.to) =>
        Array.isArray(a) ? a.map((x) => x.text).join(', ') : (a?.text ?? '');
      return {
        id: file.replace(/\.eml$/, ''),
        date: parsed.date ?? new Date(0),
        from: parsed.from?.text ?? '',
        to: addr(parsed.to),
        subject: parsed.subject ?? '',
        text: parsed.text ?? '',
        headers: Object.fromEntries(
          parsed.headerLines.map((h) => [
            h.key,
            h.line
              .slice(h.line.indexOf(':') + 1)
              .replace(/\r?\n\s+/g, ' ')
              .trim(),
          ]),
        ),
      };
    }),
  );
}
