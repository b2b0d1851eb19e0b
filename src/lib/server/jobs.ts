import { forgetOldMailRequests } from './auth/mail-limits.ts';
import { db } from './db/index.ts';
import { startOutbox } from './outbox.ts';
import { cleanStaleUploads } from './uploads.ts';

// Background work of a server process: mail delivery, removing uploads that were declared but
// never completed (their objects too), and dropping mail-limit counters that no longer count.
// All are safe with several processes running.

const CLEANUP_EVERY_MS = 10 * 60 * 1000;
let started = false;

/** Starts the background jobs once per process. */
export function startJobs(): void {
  if (started) return;
  started = true;
  startOutbox();
  const cleanup = () => {
    void cleanStaleUploads(db()).catch((err) =>
      console.error('[edgewise] upload cleanup failed:', err instanceof Error ? err.message : err),
    );
    void forgetOldMailRequests(db()).catch((err) =>
      console.error(
        '[edgewise] mail-limit cleanup failed:',
        err instanceof Error ? err.message : err,
      ),
    );
  };
  setInterval(cleanup, CLEANUP_EVERY_MS).unref();
  setTimeout(cleanup, 30_000).unref();
}
