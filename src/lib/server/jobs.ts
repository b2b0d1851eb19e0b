import { forgetOldMailRequests } from './auth/mail-limits.ts';
import { db } from './db/index.ts';
import { liftDueEmbargoes } from './embargoes.ts';
import { log } from './log.ts';
import { forgetOldIdempotencyKeys } from './idempotency.ts';
import { startOutbox } from './outbox.ts';
import { cleanStaleUploads, sweepStagingObjects } from './uploads.ts';
import { startWatchDigests } from './watches.ts';

// Background work of a server process: mail delivery, removing uploads that were declared but
// never completed (their objects too), dropping mail-limit counters and idempotency keys that no
// longer count, and lifting embargoes on their day (checked every few minutes, so within minutes
// of midnight UTC).
// All are safe with several processes running.

const CLEANUP_EVERY_MS = 10 * 60 * 1000;
const EMBARGO_EVERY_MS = 5 * 60 * 1000;
let started = false;

/** Starts the background jobs once per process. */
export function startJobs(): void {
  if (started) return;
  started = true;
  startOutbox();
  startWatchDigests();
  const cleanup = () => {
    void cleanStaleUploads(db())
      .then(() => sweepStagingObjects(db()))
      .catch((err) => log().error({ err }, 'upload cleanup failed'));
    void forgetOldIdempotencyKeys().catch((err) =>
      log().error({ err }, 'idempotency-key cleanup failed'),
    );
    void forgetOldMailRequests(db()).catch((err) =>
      log().error({ err }, 'mail-limit cleanup failed'),
    );
  };
  setInterval(cleanup, CLEANUP_EVERY_MS).unref();
  setTimeout(cleanup, 30_000).unref();
  const embargoes = () =>
    void liftDueEmbargoes(db()).catch((err) => log().error({ err }, 'embargo lifting failed'));
  setInterval(embargoes, EMBARGO_EVERY_MS).unref();
  setTimeout(embargoes, 5_000).unref();
}
