import { MESSAGES_PER_ADDRESS } from '#lib/server/auth/mail-limits.ts';
import { notificationsQuery } from '#lib/shared/curation.ts';
import { queryParameters, body, errors, ok, noContent, uuid, signedIn } from './parts.ts';

/** Operations of the Account tag. */
export const accountPaths = {
  '/me': {
    get: {
      operationId: 'whoAmI',
      tags: ['Account'],
      summary: 'Who the request is from, as the server sees it',
      responses: {
        '200': ok(
          'Principal',
          '`kind` anonymous, or the user with role, labs, how they came (session or token) and scopes',
        ),
      },
    },
  },
  '/account': {
    get: {
      operationId: 'getAccount',
      tags: ['Account'],
      summary: 'Your profile',
      security: signedIn,
      responses: { '200': ok('Profile', 'The profile'), ...errors(401) },
    },
    patch: {
      operationId: 'updateAccount',
      tags: ['Account'],
      summary: 'Change your name, affiliation or ORCID iD',
      security: signedIn,
      requestBody: body('ProfileChange'),
      responses: { '200': ok('Profile', 'The profile'), ...errors(400, 401, 413) },
    },
  },
  '/account/signup': {
    post: {
      operationId: 'signUp',
      tags: ['Account'],
      summary: 'Make a reader account; a link to confirm the address is mailed',
      description:
        'Answers 202 whether or not the address already has an account; the e-mail tells its owner which. ' +
        `At most ${MESSAGES_PER_ADDRESS} sign-up messages go to one address per hour (further requests answer 202 and send nothing); ` +
        'a network address that makes too many requests that send e-mail within an hour gets 429.',
      requestBody: body('SignUp'),
      responses: {
        '202': ok('StatusMessage', 'Check your e-mail'),
        ...errors(
          [400, 'Invalid request, or a password that is too weak (`errors` says why)'],
          413,
          429,
        ),
      },
    },
  },
  '/account/confirm': {
    post: {
      operationId: 'confirmEmail',
      tags: ['Account'],
      summary: 'Confirm an e-mail address with the token from the mailed link',
      requestBody: body('EmailToken'),
      responses: {
        '200': ok('StatusMessage', 'Confirmed'),
        ...errors(400, [404, 'The link is unknown, used or expired'], 413),
      },
    },
  },
  '/account/password': {
    post: {
      operationId: 'changePassword',
      tags: ['Account'],
      summary: 'Change your password; every session of the account ends, this one included',
      security: signedIn,
      requestBody: body('PasswordChange'),
      responses: {
        '204': noContent('Changed'),
        ...errors([400, 'Invalid request, a wrong current password, or a weak new one'], 401, 413),
      },
    },
  },
  '/account/password/forgot': {
    post: {
      operationId: 'requestPasswordReset',
      tags: ['Account'],
      summary: 'Mail a password reset link',
      description:
        'Answers 202 whether or not the address has an account. ' +
        `At most ${MESSAGES_PER_ADDRESS} reset links go to one address per hour (further requests answer 202 and send nothing); ` +
        'a network address that makes too many requests that send e-mail within an hour gets 429.',
      requestBody: body('EmailAddress'),
      responses: { '202': ok('StatusMessage', 'Check your e-mail'), ...errors(400, 413, 429) },
    },
  },
  '/account/password/reset': {
    post: {
      operationId: 'resetPassword',
      tags: ['Account'],
      summary: 'Set a new password with the token from the mailed link; every session ends',
      requestBody: body('PasswordReset'),
      responses: {
        '200': ok('StatusMessage', 'Password changed'),
        ...errors(
          [400, 'Invalid request, or a weak password'],
          [404, 'The link is unknown, used or expired'],
          413,
        ),
      },
    },
  },
  '/account/tokens': {
    get: {
      operationId: 'listApiTokens',
      tags: ['Account'],
      summary: 'Your API tokens (never their secrets)',
      security: signedIn,
      responses: {
        '200': ok('ApiTokenList', '`tokens`, each active, expired or revoked'),
        ...errors(401),
      },
    },
    post: {
      operationId: 'createApiToken',
      tags: ['Account'],
      summary: 'Make an API token; its secret is in this answer only',
      description: 'Only a browser session may make tokens: a token cannot make another.',
      security: [{ session: [] }],
      requestBody: body('CreateApiToken'),
      responses: {
        '201': ok('NewApiToken', 'The token with its secret'),
        ...errors(400, 401, [403, 'Tokens are made from a browser session only'], 413),
      },
    },
  },
  '/account/tokens/{id}': {
    parameters: [uuid('The token id')],
    delete: {
      operationId: 'revokeApiToken',
      tags: ['Account'],
      summary: 'Revoke one of your API tokens (revoking twice is fine)',
      security: signedIn,
      responses: { '204': noContent('Revoked'), ...errors(401, 404) },
    },
  },
  '/account/notifications': {
    get: {
      operationId: 'listNotifications',
      tags: ['Account'],
      summary: 'The messages about your records, flags and proposals, newest first',
      security: signedIn,
      parameters: queryParameters(notificationsQuery),
      responses: {
        '200': ok('NotificationPage', 'Total and a page of messages'),
        ...errors(400, 401),
      },
    },
  },
};
