import type { Action } from './policy.ts';
import type { RecordStatus, TransitionAction } from '../shared/record.ts';

// The status machine of a window record, in one place:
//
//   draft ─submit→ submitted ─request-changes→ changes_requested ─submit→ submitted
//   submitted ─publish→ published | ─decline→ declined
//   published ─flag→ flagged ─resolve-flag→ published | ─request-changes→ changes_requested
//   published | flagged ─withdraw→ withdrawn
//
// Each move names the policy action that decides who may make it.

export interface Transition {
  from: readonly RecordStatus[];
  to: RecordStatus;
  /** The policy action asked before the move. */
  policy: Action;
  /** Recorded as a curator decision in `reviews`. */
  review: boolean;
}

export const TRANSITIONS: Readonly<Record<TransitionAction, Transition>> = {
  submit: {
    from: ['draft', 'changes_requested'],
    to: 'submitted',
    policy: 'record.submit',
    review: false,
  },
  'request-changes': {
    from: ['submitted', 'flagged'],
    to: 'changes_requested',
    policy: 'record.review',
    review: true,
  },
  publish: { from: ['submitted'], to: 'published', policy: 'record.review', review: true },
  decline: { from: ['submitted'], to: 'declined', policy: 'record.review', review: true },
  flag: { from: ['published', 'flagged'], to: 'flagged', policy: 'record.flag', review: false },
  'resolve-flag': { from: ['flagged'], to: 'published', policy: 'flag.resolve', review: true },
  withdraw: {
    from: ['published', 'flagged'],
    to: 'withdrawn',
    policy: 'record.withdraw',
    review: true,
  },
};

/** Statuses in which the content may change (each change is a new version). */
export const EDITABLE: readonly RecordStatus[] = ['draft', 'changes_requested'];

/** The status after `action`, or null when the move is not allowed from `from`. */
export function nextStatus(from: RecordStatus, action: TransitionAction): RecordStatus | null {
  const t = TRANSITIONS[action];
  return t.from.includes(from) ? t.to : null;
}

/** Actions possible from a status (before asking who may). */
export function actionsFrom(from: RecordStatus): TransitionAction[] {
  return (Object.keys(TRANSITIONS) as TransitionAction[]).filter((a) =>
    TRANSITIONS[a].from.includes(from),
  );
}

/** Statuses in which a record is shown in public lists by default. */
export const LISTED: readonly RecordStatus[] = ['published', 'flagged'];
