import { decide } from '#lib/server/curation.ts';
import { authorizeTransitionAttempt } from '#lib/server/record-transitions.ts';
import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readJson } from '#lib/server/http/route.ts';
import { transitionRecord } from '#lib/server/record-transitions.ts';
import { getRecord } from '#lib/server/record-views.ts';
import { DECISIONS, decisionBody } from '#lib/shared/curation.ts';
import { transitionBody } from '#lib/shared/record.ts';
import { recordDetailSchema } from '#lib/shared/record-views.ts';

const isDecision = (action: string): action is (typeof DECISIONS)[number] =>
  (DECISIONS as readonly string[]).includes(action);

/**
 * Moves a record through its lifecycle. Curators' decisions (publish, request changes, decline)
 * take the review path, so they are claimed, commented and mailed the same way from here; anyone
 * else gets the status machine's own answer (404 unseen, 403 not theirs, 409 not now).
 */
export const POST = endpoint(
  async ({ locals, params, request }) => {
    const body = await readJson(request, transitionBody);
    const p = locals.principal;
    if (
      isDecision(body.action) &&
      p.kind === 'user' &&
      (p.role === 'curator' || p.role === 'admin')
    ) {
      const decision = decisionBody.parse({
        decision: body.action,
        version: body.version,
        ...(body.reason ? { reason: body.reason } : {}),
      });
      await decide(db(), locals.principal, params.handle!, decision);
      return answer(recordDetailSchema, await getRecord(db(), locals.principal, params.handle!));
    }
    return answer(
      recordDetailSchema,
      await transitionRecord(db(), locals.principal, params.handle!, body),
    );
  },
  {
    attempt: 'record.submit',
    idempotent: true,
    guard: ({ locals, params }) =>
      authorizeTransitionAttempt(db(), locals.principal, params.handle!),
  },
);
