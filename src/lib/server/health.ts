import { sql } from 'kysely';
import { db } from './db/index.ts';
import { pingMail } from './mail.ts';
import { pingStorage } from './storage.ts';

export type PartState = 'up' | 'down';
export interface Health {
  status: PartState;
  parts: { database: PartState; storage: PartState; mail: PartState };
}

async function pingDatabase(): Promise<boolean> {
  try {
    await sql`SELECT 1`.execute(db());
    return true;
  } catch {
    return false;
  }
}

const state = (ok: boolean): PartState => (ok ? 'up' : 'down');

/** Checks the database, object storage and mail server in parallel. */
export async function checkHealth(): Promise<Health> {
  const [database, storage, mail] = await Promise.all([pingDatabase(), pingStorage(), pingMail()]);
  const parts = { database: state(database), storage: state(storage), mail: state(mail) };
  return { status: database && storage && mail ? 'up' : 'down', parts };
}
