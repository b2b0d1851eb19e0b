import type { RecordEventKind } from '../shared/watch.ts';
import type { DbOrTrx } from './repositories/audit.ts';
import { insertRecordEvent } from './repositories/watches.ts';

// The record lifecycle's side of watches, kept apart from the digest (which searches records) so
// the lifecycle does not import the search: a status change notes its event here, in its own
// transaction, and whoever runs digests in this process is woken.

let wake: (() => void) | null = null;

/** Called by the digest runner of this process (see watches.ts). */
export function onRecordEvent(fn: () => void): void {
  wake = fn;
}

/** Notes a change of a record that watches report; inside the transaction of the status change. */
export async function noteRecordEvent(
  trx: DbOrTrx,
  e: { recordId: string; handle: string; version: number; kind: RecordEventKind },
): Promise<void> {
  await insertRecordEvent(trx, e);
  wake?.();
}
