import { db } from '#lib/server/db/index.ts';
import { answer } from '#lib/server/http/problem.ts';
import { endpoint, readQuery } from '#lib/server/http/route.ts';
import { listNotifications } from '#lib/server/curation-log.ts';
import { notificationsQuery } from '#lib/shared/curation.ts';
import { notificationPageSchema } from '#lib/shared/answers.ts';

export const GET = endpoint(
  async ({ locals, url }) =>
    answer(
      notificationPageSchema,
      await listNotifications(db(), locals.principal, readQuery(url, notificationsQuery)),
    ),
  { attempt: 'notification.list' },
);
