import { z } from 'zod';
import {
  apiTokenInput,
  changePasswordInput,
  emailInput,
  labCreateInput,
  memberAddInput,
  memberChangeInput,
  profileInput,
  resetPasswordInput,
  signUpInput,
  tokenInput,
  userChangeInput,
} from '#lib/shared/account.ts';
import {
  claimBody,
  decisionBody,
  flagResolutionBody,
  mergeBody,
  proposalBody,
  proposalDecisionBody,
  referenceValueBody,
} from '#lib/shared/curation.ts';
import {
  createRecordBody,
  createUploadBody,
  editRecordBody,
  transitionBody,
} from '#lib/shared/record.ts';
import type { AnswerName } from './answers.ts';
import { createSelectionBody } from '#lib/shared/selection.ts';
import { createWatchBody, unsubscribeBody } from '#lib/shared/watch.ts';

// The pieces every tag's operations are made of: JSON Schema from zod, request bodies by name,
// problem answers, path parameters and the security of signed-in operations.

export type Json = Record<string, unknown>;

export function schemaOf(s: z.ZodType, io: 'input' | 'output' = 'input'): Json {
  const out = z.toJSONSchema(s, { io, unrepresentable: 'any', target: 'draft-2020-12' }) as Json;
  delete out.$schema;
  return out;
}

export function queryParameters(s: z.ZodObject): Json[] {
  return Object.entries(s.shape).map(([name, field]) => {
    const schema = schemaOf(field as z.ZodType);
    const description = (field as z.ZodType).description;
    return {
      name,
      in: 'query',
      required: !(field as z.ZodType).safeParse(undefined).success,
      schema,
      ...(description ? { description } : {}),
    };
  });
}

/** JSON request bodies by component name, each the schema its route parses with. */
export const BODIES = {
  CreateRecord: createRecordBody,
  EditRecord: editRecordBody,
  Transition: transitionBody,
  CreateUpload: createUploadBody,
  SignUp: signUpInput,
  EmailAddress: emailInput,
  EmailToken: tokenInput,
  PasswordReset: resetPasswordInput,
  PasswordChange: changePasswordInput,
  ProfileChange: profileInput,
  CreateApiToken: apiTokenInput,
  AccountChange: userChangeInput,
  CreateLab: labCreateInput,
  AddMember: memberAddInput,
  MemberChange: memberChangeInput,
  Claim: claimBody,
  Decision: decisionBody,
  FlagResolution: flagResolutionBody,
  TermProposal: proposalBody,
  ProposalDecision: proposalDecisionBody,
  TermMerge: mergeBody,
  ReferenceValue: referenceValueBody,
  CreateSelection: createSelectionBody,
  CreateWatch: createWatchBody,
  Unsubscribe: unsubscribeBody,
} satisfies Record<string, z.ZodType>;

export const body = (name: keyof typeof BODIES): Json => ({
  required: true,
  content: { 'application/json': { schema: { $ref: `#/components/schemas/${name}` } } },
});

export const problem = { $ref: '#/components/schemas/Problem' };
const ERROR_TEXT: Record<number, string> = {
  400: 'Invalid request; `errors` names each field',
  401: 'Sign in first',
  403: 'Not allowed',
  404: 'Not found, or not visible to you',
  409: 'In conflict with the current state; `detail` says how',
  413: 'The JSON body is over 1 MiB',
  422: 'The content was refused; `errors` says where',
  429: 'Too many requests from your network address; retry after the Retry-After delay',
  503: 'Storage or database unavailable; retry after the Retry-After delay',
};
/** Problem responses: a status alone takes the usual text; `[status, text]` says what it means here. */
export const errors = (...codes: (number | [number, string])[]): Json =>
  Object.fromEntries(
    codes.map((c) => {
      const [code, text] = typeof c === 'number' ? [c, ERROR_TEXT[c] ?? 'Error'] : c;
      return [
        String(code),
        { description: text, content: { 'application/problem+json': { schema: problem } } },
      ];
    }),
  );
/** A JSON success answer: the named schema of ANSWERS (./answers.ts), which the route builds to. */
export const ok = (name: AnswerName, description: string): Json => ({
  description,
  content: { 'application/json': { schema: { $ref: `#/components/schemas/${name}` } } },
});
export const noContent = (description: string): Json => ({ description });

export const pathParam = (name: string, schema: Json, description: string): Json => ({
  name,
  in: 'path',
  required: true,
  schema,
  description,
});
export const handle = pathParam(
  'handle',
  { type: 'string', pattern: '^EW-[0-9]{6,}$' },
  'The record handle, such as EW-000123',
);
export const uuid = (description: string, name = 'id'): Json =>
  pathParam(name, { type: 'string', format: 'uuid' }, description);
export const labSlug = pathParam('slug', { type: 'string' }, 'The lab slug');

/** Operations that need a signed-in user: a browser session or an API token. */
export const signedIn = [{ session: [] }, { token: [] }];
