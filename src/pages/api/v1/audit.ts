import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { auditLog } from '#lib/server/curation-log.ts';
import { auditQuery } from '#lib/shared/curation.ts';
import { auditPageSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(
  async ({ locals, url }) =>
    answer(auditPageSchema, await auditLog(db(), locals.principal, readQuery(url, auditQuery))),
  { attempt: 'audit.read' },
);
