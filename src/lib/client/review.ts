import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type {
  AuditEventView,
  DecisionBody,
  FlagItem,
  NotificationView,
  ProposalView,
  QueueResult,
  ReferenceValueView,
  ReviewDetail,
} from '../shared/curation.ts';
import type { VocabularyTerm } from '../shared/vocabulary.ts';
import { apiPath, getJson, sendJson } from './api.ts';

// The curator's API as the browser sees it: one queryOptions factory per request, every input in
// its key, and the mutations the review screens send. Types only from src/lib/shared.

export interface QueueFilters {
  lab?: string;
  method?: string;
  evidence?: string;
  hasRaw?: '' | 'true' | 'false';
  disagreement?: '' | 'true' | 'false';
  claimed?: '' | 'mine' | 'others' | 'none';
  offset?: number;
}

export interface AuditFilters {
  actor?: string;
  record?: string;
  action?: string;
  from?: string;
  to?: string;
  offset?: number;
}

export const reviewQueries = {
  queue: (f: QueueFilters) =>
    queryOptions({
      queryKey: ['review', 'queue', f],
      queryFn: ({ signal }) =>
        getJson<QueueResult>(apiPath('/api/v1/review/queue', { ...f, limit: 50 }), signal),
      placeholderData: keepPreviousData,
    }),
  record: (handle: string) =>
    queryOptions({
      queryKey: ['review', 'record', handle],
      queryFn: ({ signal }) => getJson<ReviewDetail>(`/api/v1/review/records/${handle}`, signal),
      staleTime: 0,
    }),
  flags: (status: 'open' | 'resolved' | 'all') =>
    queryOptions({
      queryKey: ['review', 'flags', status],
      queryFn: ({ signal }) =>
        getJson<{ total: number; items: FlagItem[] }>(
          apiPath('/api/v1/review/flags', { status, limit: 100 }),
          signal,
        ),
    }),
  proposals: (status: 'proposed' | 'accepted' | 'rejected' | 'all') =>
    queryOptions({
      queryKey: ['review', 'proposals', status],
      queryFn: ({ signal }) =>
        getJson<{ total: number; items: ProposalView[] }>(
          apiPath('/api/v1/vocabulary/proposals', { status, limit: 100 }),
          signal,
        ),
    }),
  vocabulary: (kind: string) =>
    queryOptions({
      queryKey: ['review', 'vocabulary', kind],
      queryFn: ({ signal }) =>
        getJson<{ terms: VocabularyTerm[] }>(apiPath('/api/v1/vocabulary', { kind }), signal),
    }),
  referenceValues: (termId: string) =>
    queryOptions({
      queryKey: ['review', 'reference-values', termId],
      queryFn: ({ signal }) =>
        getJson<{ term: VocabularyTerm; values: ReferenceValueView[] }>(
          `/api/v1/vocabulary/terms/${encodeURIComponent(termId)}/reference-values`,
          signal,
        ),
    }),
  audit: (f: AuditFilters) =>
    queryOptions({
      queryKey: ['review', 'audit', f],
      queryFn: ({ signal }) =>
        getJson<{ total: number; limit: number; offset: number; items: AuditEventView[] }>(
          apiPath('/api/v1/audit', { ...f, limit: 50 }),
          signal,
        ),
      placeholderData: keepPreviousData,
    }),
  notifications: (offset: number) =>
    queryOptions({
      queryKey: ['account', 'notifications', offset],
      queryFn: ({ signal }) =>
        getJson<{ total: number; items: NotificationView[] }>(
          apiPath('/api/v1/account/notifications', { offset, limit: 10 }),
          signal,
        ),
    }),
};

export const reviewActions = {
  claim: (handle: string, minutes = 30) =>
    sendJson(`/api/v1/review/records/${handle}/claim`, { minutes }),
  release: (handle: string) =>
    sendJson<void>(`/api/v1/review/records/${handle}/claim`, undefined, 'DELETE'),
  decide: (handle: string, body: DecisionBody) =>
    sendJson<{ handle: string; status: string; version: number }>(
      `/api/v1/review/records/${handle}/decision`,
      body,
    ),
  resolveFlag: (
    id: string,
    body: { outcome: 'dismiss' | 'request-changes' | 'withdraw'; version: number; reason: string },
  ) => sendJson(`/api/v1/review/flags/${id}/resolution`, body),
  decideProposal: (
    id: string,
    body: { decision: 'accept' | 'reject'; reason?: string; termId?: string },
  ) => sendJson(`/api/v1/vocabulary/proposals/${id}/decision`, body),
  merge: (from: string, into: string) =>
    sendJson<{ records: { handle: string; version: number }[] }>('/api/v1/vocabulary/merges', {
      from,
      into,
    }),
  referenceValue: (
    termId: string,
    body: { potentialVsSheV: number; source: string; note?: string },
  ) => sendJson(`/api/v1/vocabulary/terms/${encodeURIComponent(termId)}/reference-values`, body),
};
