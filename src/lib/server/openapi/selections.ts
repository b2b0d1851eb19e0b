import { CITATION_FORMATS } from '#lib/shared/selection.ts';
import { body, errors, ok, pathParam, signedIn } from './parts.ts';

const selectionHandle = pathParam(
  'handle',
  { type: 'string', pattern: '^ES-[0-9]{6,}$' },
  'The selection handle, such as ES-000012',
);

/** Operations of the Selections tag. */
export const selectionsPaths = {
  '/selections': {
    post: {
      operationId: 'createSelection',
      tags: ['Selections'],
      summary:
        'Freeze the public records a comparison finds (the /windows address) at their current versions, with the numbers it shows',
      description:
        'Only published and flagged public records enter a selection, whoever asks. Later versions of the records never change it; its answer says when newer versions exist.',
      security: signedIn,
      requestBody: body('CreateSelection'),
      responses: {
        '201': ok('Selection', 'The selection'),
        ...errors(
          [400, 'Invalid request, or the comparison finds no public record or too many'],
          401,
          403,
          413,
        ),
      },
    },
  },
  '/selections/{handle}': {
    get: {
      operationId: 'getSelection',
      tags: ['Selections'],
      summary: 'A selection as frozen, with what changed in its records since',
      parameters: [selectionHandle],
      responses: { '200': ok('Selection', 'The selection'), ...errors(404) },
    },
  },
  '/selections/{handle}/citation': {
    get: {
      operationId: 'citeSelection',
      tags: ['Selections'],
      summary: 'The citation of a selection: text, BibTeX, CSL-JSON or DataCite-style metadata',
      parameters: [
        selectionHandle,
        {
          name: 'format',
          in: 'query',
          required: false,
          schema: { type: 'string', enum: [...CITATION_FORMATS], default: 'bibtex' },
          description: 'Citation format',
        },
      ],
      responses: {
        '200': {
          description: 'The citation, as a download',
          content: {
            'text/plain': { schema: { type: 'string' } },
            'application/x-bibtex': { schema: { type: 'string' } },
            'application/vnd.citationstyles.csl+json': { schema: { type: 'array' } },
            'application/json': { schema: { type: 'object' } },
          },
        },
        ...errors(400, 404),
      },
    },
  },
};
