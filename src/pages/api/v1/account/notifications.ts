import { db } from '#lib/server/db/index.ts';
import { json } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { listNotifications } from '#lib/server/curation-log.ts';
import { notificationsQuery } from '#lib/shared/curation.ts';

export const GET = endpoint(async ({ locals, url }) =>
  json(await listNotifications(db(), locals.principal, readQuery(url, notificationsQuery))),
);
