import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson, readQuery } from '#lib/server/http/route.ts';
import { listProposals, proposeTerm } from '#lib/server/vocabulary-upkeep.ts';
import { proposalBody, proposalsQuery } from '#lib/shared/curation.ts';
import { proposalViewSchema } from '#lib/shared/curation.ts';
import { proposalPageSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(async ({ locals, url }) =>
  answer(
    proposalPageSchema,
    await listProposals(db(), locals.principal, readQuery(url, proposalsQuery)),
  ),
);

export const POST = endpoint(
  async ({ locals, request }) =>
    answer(
      proposalViewSchema,
      await proposeTerm(db(), locals.principal, await readJson(request, proposalBody)),
      201,
    ),
  { attempt: 'vocabulary.propose' },
);
