import { ok } from './parts.ts';

/** Operations of the Meta tag. */
export const metaPaths = {
  '/openapi.json': {
    get: {
      operationId: 'openapi',
      tags: ['Meta'],
      summary: 'This document',
      responses: { '200': ok('OpenApiDocument', 'OpenAPI 3.1 document') },
    },
  },
};
