import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readJson, readQuery } from '#lib/server/http/route.ts';
import { listProposals, proposeTerm } from '#lib/server/vocabulary-upkeep.ts';
import { proposalBody, proposalsQuery } from '#lib/shared/curation.ts';

export const GET = endpoint(async ({ locals, url }) =>
  json(await listProposals(db(), locals.principal, readQuery(url, proposalsQuery))),
);

export const POST = endpoint(async ({ locals, request }) =>
  json(await proposeTerm(db(), locals.principal, await readJson(request, proposalBody)), 201),
);
