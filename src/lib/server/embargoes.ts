import { config } from './config.ts';
import type { Db } from './db/index.ts';
import { queueMail, wakeOutbox } from './outbox.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import { personOf } from './repositories/curation.ts';
import { listLabMembers } from './repositories/labs.ts';
import { dueEmbargoes, getRecordHeadById, markEmbargoLifted } from './repositories/records.ts';

// Embargoes lift by themselves. A lab-private record is readable by everyone from its embargo
// day on (the policy compares the date with the clock); this job notes the lift once per record
// and embargo day, which moves the search generation so held search answers include the record,
// writes the audit event and tells the lab's members and the owner. Safe with several processes:
// the note is a compare-and-set, so one of them mails.

/** Lifts every embargo that ended on or before `now`'s UTC day; the handles lifted. */
export async function liftDueEmbargoes(db: Db, now: Date = new Date()): Promise<string[]> {
  const day = now.toISOString().slice(0, 10);
  const lifted: string[] = [];
  for (const due of await dueEmbargoes(db, day)) {
    const done = await db.transaction().execute(async (trx) => {
      if (!(await markEmbargoLifted(trx, due.id, due.embargo_until))) return false;
      const head = (await getRecordHeadById(trx, due.id))!;
      await insertAuditEvent(trx, {
        actorId: null,
        action: 'record.embargo-lift',
        subjectType: 'record',
        subjectId: head.handle,
        details: { embargoUntil: due.embargo_until, version: head.published_version },
      });
      const to = new Map<string, string>();
      if (head.lab_id)
        for (const m of await listLabMembers(trx, head.lab_id)) to.set(m.email, m.name ?? '');
      const owner = await personOf(trx, head.owner_id);
      if (owner) to.set(owner.email, owner.name);
      const link = new URL(`/windows/${head.handle}`, config().PUBLIC_ORIGIN).toString();
      for (const email of to.keys())
        await queueMail(trx, {
          kind: 'record.embargo-lifted',
          to: email,
          subject: `${head.handle} is now public: its embargo ended on ${due.embargo_until}`,
          text: [
            `The embargo on ${head.handle} (version ${head.published_version}) of ${head.lab_name ?? 'your lab'} ended on ${due.embargo_until}.`,
            'From today every reader can see it, search for it and cite it, signed in or not.',
            '',
            `The record: ${link}`,
            '',
            '— Edgewise',
          ].join('\n'),
        });
      return true;
    });
    if (done) lifted.push(due.handle);
  }
  if (lifted.length) wakeOutbox();
  return lifted;
}
