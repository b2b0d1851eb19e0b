import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { decideProposal } from '#lib/server/vocabulary-upkeep.ts';
import { proposalDecisionBody } from '#lib/shared/curation.ts';
import { proposalViewSchema } from '#lib/shared/curation.ts';

export const POST = endpoint(
  async ({ locals, params, request }) =>
    answer(
      proposalViewSchema,
      await decideProposal(
        db(),
        locals.principal,
        params.id!,
        await readJson(request, proposalDecisionBody),
      ),
    ),
  { attempt: 'vocabulary.decide' },
);
