import { accountsQuerySchema } from '#lib/server/admin.ts';
import { queryParameters, body, errors, ok, uuid, signedIn } from './parts.ts';

/** Operations of the Admin tag. */
export const adminPaths = {
  '/admin/users': {
    get: {
      operationId: 'listAccounts',
      tags: ['Admin'],
      summary: 'Accounts, searched by name or e-mail address',
      security: signedIn,
      parameters: queryParameters(accountsQuerySchema),
      responses: {
        '200': ok('AccountPage', 'Total and a page of accounts'),
        ...errors(400, 401, 403),
      },
    },
  },
  '/admin/users/{id}': {
    parameters: [uuid('The user id')],
    patch: {
      operationId: 'changeAccount',
      tags: ['Admin'],
      summary: 'Change an account’s role, or disable or enable it',
      description:
        'The change applies from the person’s next request, and they are told by e-mail. Administrators cannot change or disable themselves.',
      security: signedIn,
      requestBody: body('AccountChange'),
      responses: { '200': ok('AdminAccount', 'The account'), ...errors(400, 401, 403, 404, 413) },
    },
  },
};
