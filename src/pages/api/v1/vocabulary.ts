import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { listVocabulary, vocabularyQuerySchema } from '#lib/server/vocabulary.ts';
import { termListSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, url }) => {
  const q = readQuery(url, vocabularyQuerySchema);
  return answer(termListSchema, {
    terms: await listVocabulary(db(), locals.principal, {
      ...(q.kind ? { kind: q.kind } : {}),
      ...(q.q ? { q: q.q } : {}),
    }),
  });
});
