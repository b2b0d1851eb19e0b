import { z } from 'zod';
import { db } from '../../../lib/server/db/index.ts';
import { json } from '../../../lib/server/http/problem.ts';
import { endpoint, readQuery } from '../../../lib/server/http/route.ts';
import { listVocabulary } from '../../../lib/server/vocabulary.ts';
import { VOCABULARY_KINDS } from '../../../lib/shared/vocabulary.ts';

export const vocabularyQuery = z.strictObject({ kind: z.enum(VOCABULARY_KINDS).optional(), q: z.string().trim().min(1).max(200).optional() });

export const GET = endpoint(async ({ locals, url }) => {
  const q = readQuery(url, vocabularyQuery);
  return json({ terms: await listVocabulary(db(), locals.principal, { ...(q.kind ? { kind: q.kind } : {}), ...(q.q ? { q: q.q } : {}) }) });
});
