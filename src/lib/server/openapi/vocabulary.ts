import { vocabularyQuerySchema } from '#lib/server/vocabulary.ts';
import { proposalsQuery } from '#lib/shared/curation.ts';
import { queryParameters, body, errors, ok, pathParam, uuid, signedIn } from './parts.ts';

/** Operations of the Vocabulary tag. */
export const vocabularyPaths = {
  '/vocabulary': {
    get: {
      operationId: 'listVocabulary',
      tags: ['Vocabulary'],
      summary: 'Vocabulary terms with abbreviations and synonyms',
      parameters: queryParameters(vocabularyQuerySchema),
      responses: {
        '200': ok('TermList', 'Terms'),
        ...errors(400),
      },
    },
  },
  '/vocabulary/proposals': {
    get: {
      operationId: 'listProposals',
      tags: ['Vocabulary'],
      summary: 'Proposed terms: every proposal for curators, your own for contributors',
      security: signedIn,
      parameters: queryParameters(proposalsQuery),
      responses: {
        '200': ok('ProposalPage', 'Total and a page of proposals'),
        ...errors(400, 401, 403),
      },
    },
    post: {
      operationId: 'proposeTerm',
      tags: ['Vocabulary'],
      summary: 'Propose a new term for curators to accept or reject',
      security: signedIn,
      requestBody: body('TermProposal'),
      responses: {
        '201': ok('Proposal', 'The proposal'),
        ...errors(
          400,
          401,
          403,
          [409, 'The vocabulary or an open proposal already has this name'],
          413,
        ),
      },
    },
  },
  '/vocabulary/proposals/{id}/decision': {
    parameters: [uuid('The proposal id')],
    post: {
      operationId: 'decideProposal',
      tags: ['Vocabulary'],
      summary: 'Accept a proposed term (it joins the vocabulary) or reject it with a reason',
      security: signedIn,
      requestBody: body('ProposalDecision'),
      responses: {
        '200': ok('Proposal', 'The decided proposal'),
        ...errors(
          400,
          401,
          403,
          404,
          [409, 'Already decided, or the name reached the vocabulary meanwhile'],
          413,
        ),
      },
    },
  },
  '/vocabulary/merges': {
    post: {
      operationId: 'mergeTerms',
      tags: ['Vocabulary'],
      summary: 'Merge a duplicate term into another of the same kind',
      description:
        'The duplicate’s names become synonyms of the surviving term, and every record naming the duplicate gets a new version naming the survivor.',
      security: signedIn,
      requestBody: body('TermMerge'),
      responses: {
        '200': ok('MergeResult', 'Both terms and the records that gained a version'),
        ...errors(400, 401, 403, [409, 'The duplicate was already merged'], 413),
      },
    },
  },
  '/vocabulary/terms/{id}/reference-values': {
    parameters: [pathParam('id', { type: 'string' }, 'The reference electrode’s term id')],
    get: {
      operationId: 'referenceValueHistory',
      tags: ['Vocabulary'],
      summary: 'A reference electrode’s potential vs SHE and the values it has had, newest first',
      responses: { '200': ok('ReferenceHistory', 'The term and its values'), ...errors(404) },
    },
    post: {
      operationId: 'reviseReferenceValue',
      tags: ['Vocabulary'],
      summary: 'Revise a reference electrode’s potential vs SHE, with its source',
      description:
        'New versions are computed with the new value; existing versions keep the value they were computed with and show that a newer one exists.',
      security: signedIn,
      requestBody: body('ReferenceValue'),
      responses: {
        '201': ok('ReferenceHistory', 'The term and its values'),
        ...errors(
          400,
          401,
          403,
          404,
          [409, 'The term was merged into another; revise that one'],
          413,
        ),
      },
    },
  },
};
