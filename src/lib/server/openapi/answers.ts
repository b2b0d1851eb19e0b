import type { z } from 'zod';
import * as answers from '#lib/shared/answers.ts';
import { cellAnswerSchema, cellChoicesSchema } from '#lib/shared/cell-views.ts';
import { coverageSchema } from '#lib/shared/coverage-views.ts';
import { selectionViewSchema } from '#lib/shared/selection.ts';
import { watchListSchema, watchViewSchema } from '#lib/shared/watch.ts';
import {
  claimViewSchema,
  decisionResultSchema,
  proposalViewSchema,
  queueResultSchema,
  reviewDetailSchema,
} from '#lib/shared/curation.ts';
import { recordDetailSchema, searchResultSchema } from '#lib/shared/record-views.ts';

// Every JSON success answer of the API by component name: the same zod schemas the routes build
// their answers to (`answer(schema, body)` in src/lib/server/http/problem.ts), published under
// components.schemas and referenced by each operation.
export const ANSWERS = {
  Principal: answers.principalSchema,
  Profile: answers.profileSchema,
  StatusMessage: answers.statusMessageSchema,
  ApiTokenList: answers.tokenListSchema,
  NewApiToken: answers.newTokenSchema,
  NotificationPage: answers.notificationPageSchema,
  AccountPage: answers.accountsPageSchema,
  AdminAccount: answers.adminUserViewSchema,
  AnalysisResult: answers.analysisResultSchema,
  ReviewQueue: queueResultSchema,
  ReviewDetail: reviewDetailSchema,
  Claim: claimViewSchema,
  DecisionResult: decisionResultSchema,
  DuplicateList: answers.duplicateListSchema,
  FlagPage: answers.flagPageSchema,
  AuditPage: answers.auditPageSchema,
  UploadTicket: answers.uploadTicketSchema,
  UploadState: answers.uploadStateSchema,
  UploadResult: answers.uploadResultSchema,
  RawCurve: answers.rawCurveSchema,
  LabList: answers.labRefListSchema,
  LabCreated: answers.labCreatedSchema,
  Lab: answers.labViewSchema,
  LabMemberList: answers.memberListSchema,
  LabMember: answers.labMemberViewSchema,
  OpenApiDocument: answers.jsonDocumentSchema,
  SearchResult: searchResultSchema,
  RecordDetail: recordDetailSchema,
  VersionList: answers.versionListSchema,
  Diff: answers.diffSchema,
  RecordReviews: answers.recordReviewsSchema,
  RecordReferenceValues: answers.recordReferenceValuesSchema,
  Coverage: coverageSchema,
  ImportResult: answers.importResultSchema,
  TermList: answers.termListSchema,
  ProposalPage: answers.proposalPageSchema,
  Proposal: proposalViewSchema,
  MergeResult: answers.mergeResultSchema,
  ReferenceHistory: answers.referenceHistorySchema,
  Cell: cellAnswerSchema,
  CellChoices: cellChoicesSchema,
  Selection: selectionViewSchema,
  Watch: watchViewSchema,
  WatchList: watchListSchema,
} satisfies Record<string, z.ZodType>;

export type AnswerName = keyof typeof ANSWERS;
