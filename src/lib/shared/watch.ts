import { z } from 'zod';

// Watches: a saved comparison that mails its owner at most daily when its records change.

export const createWatchBody = z.strictObject({
  name: z.string().trim().min(1, 'name the watch').max(200),
  /** The comparison as the /windows address holds it (filters, common criterion, scale). */
  query: z.string().max(4000),
});

export const unsubscribeBody = z.strictObject({
  watch: z.uuid(),
  token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'not an unsubscribe token'),
});

export const RECORD_EVENT_KINDS = ['published', 'new-version', 'flagged', 'withdrawn'] as const;
export type RecordEventKind = (typeof RECORD_EVENT_KINDS)[number];

/** One change to a record the watch covers. */
export const watchChangeSchema = z.strictObject({
  handle: z.string(),
  version: z.number().int(),
  kind: z.enum(RECORD_EVENT_KINDS),
  at: z.string(),
});
export type WatchChange = z.infer<typeof watchChangeSchema>;

export const watchViewSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  /** The comparison, as the /windows address holds it. */
  query: z.string(),
  createdAt: z.string(),
  lastMailedAt: z.string().nullable(),
  /** Mail stopped by the unsubscribe link (the watch stays listed). */
  unsubscribed: z.boolean(),
  /** What changed since its owner last looked. */
  newSinceSeen: z.array(watchChangeSchema),
});
export type WatchView = z.infer<typeof watchViewSchema>;
export const watchListSchema = z.strictObject({ watches: z.array(watchViewSchema) });
