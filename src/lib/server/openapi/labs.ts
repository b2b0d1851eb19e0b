import { body, errors, ok, noContent, uuid, labSlug, signedIn } from './parts.ts';

/** Operations of the Labs tag. */
export const labsPaths = {
  '/labs': {
    get: {
      operationId: 'listLabs',
      tags: ['Labs'],
      summary: 'Every lab’s slug and name',
      responses: { '200': ok('LabList', '`labs`') },
    },
    post: {
      operationId: 'createLab',
      tags: ['Labs'],
      summary: 'Create a lab',
      security: signedIn,
      requestBody: body('CreateLab'),
      responses: {
        '201': ok('LabCreated', 'Slug and name of the new lab'),
        ...errors(400, 401, 403, [409, 'A lab with this slug exists'], 413),
      },
    },
  },
  '/labs/{slug}': {
    parameters: [labSlug],
    get: {
      operationId: 'getLab',
      tags: ['Labs'],
      summary: 'A lab; its member list only for its members and administrators',
      responses: { '200': ok('Lab', 'The lab, and whether you may manage it'), ...errors(404) },
    },
  },
  '/labs/{slug}/members': {
    parameters: [labSlug],
    get: {
      operationId: 'listLabMembers',
      tags: ['Labs'],
      summary: 'The members of a lab, for its members and administrators',
      security: signedIn,
      responses: { '200': ok('LabMemberList', '`members`'), ...errors(401, 403, 404) },
    },
    post: {
      operationId: 'addLabMember',
      tags: ['Labs'],
      summary: 'Add a member by e-mail address, or change the role of someone already in the lab',
      security: signedIn,
      requestBody: body('AddMember'),
      responses: {
        '201': ok('LabMember', 'The member'),
        ...errors(
          [400, 'Invalid request, or no active account has this address'],
          401,
          403,
          404,
          413,
        ),
      },
    },
  },
  '/labs/{slug}/members/{userId}': {
    parameters: [labSlug, uuid('The member’s user id', 'userId')],
    patch: {
      operationId: 'changeLabMember',
      tags: ['Labs'],
      summary: 'Make a member a manager, or a manager a member',
      security: signedIn,
      requestBody: body('MemberChange'),
      responses: { '200': ok('LabMember', 'The member'), ...errors(400, 401, 403, 404, 413) },
    },
    delete: {
      operationId: 'removeLabMember',
      tags: ['Labs'],
      summary: 'Remove a member from a lab',
      security: signedIn,
      responses: { '204': noContent('Removed'), ...errors(401, 403, 404) },
    },
  },
};
