import type { z } from 'zod';
import type { Db } from './db/index.ts';
import { ConflictError, NotFoundError, ValidationError } from './errors.ts';
import { queueMail, wakeOutbox } from './outbox.ts';
import { authorize, can, requireUser, type Principal } from './policy.ts';
import { refreshRecordTerms } from './records.ts';
import { insertAuditEvent } from './repositories/audit.ts';
import {
  decideProposalRow,
  getProposal,
  insertProposal,
  insertReferenceValue,
  insertTerm,
  listProposals as listProposalRows,
  lockTerm,
  markMerged,
  recordsNamingTerm,
  referenceValues,
  setReferencePotential,
  setTermNames,
  type ProposalRow,
} from './repositories/curation.ts';
import { findTermsByKeys, getTermsByIds, toTerm } from './repositories/vocabulary.ts';
import type {
  ProposalView,
  ReferenceValueView,
  mergeBody,
  proposalBody,
  proposalDecisionBody,
  proposalsQuery,
  referenceValueBody,
} from '../shared/curation.ts';
import { lookupKey, termKeys, type VocabularyTerm } from '../shared/vocabulary.ts';
import type { MergeResult } from '#lib/shared/answers.ts';
export type { MergeResult };

// Keeping the vocabulary clean: proposed terms accepted or rejected, duplicates merged (the old
// name stays as a synonym and every record follows), reference-electrode values revised with
// their source while records keep the offset they were computed with.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const SIGNATURE = '\n\n— Edgewise curation\n';

function toProposal(r: ProposalRow): ProposalView {
  return {
    id: r.id,
    kind: r.kind,
    name: r.name,
    abbreviations: r.abbreviations,
    synonyms: r.synonyms,
    formula: r.formula,
    note: r.note,
    proposer: r.proposer,
    status: r.status,
    termId: r.term_id,
    decidedBy: r.decided_by,
    decidedAt: r.decided_at?.toISOString() ?? null,
    reason: r.decision_reason,
    createdAt: r.created_at.toISOString(),
  };
}

const isUniqueViolation = (e: unknown) => (e as { code?: string })?.code === '23505';

/** A contributor proposes a term; 409 when the vocabulary (or an open proposal) already has the name. */
export async function proposeTerm(
  db: Db,
  principal: Principal,
  body: z.output<typeof proposalBody>,
): Promise<ProposalView> {
  authorize(principal, 'vocabulary.propose', null);
  const user = requireUser(principal);
  const names = [body.name, ...body.abbreviations, ...body.synonyms];
  const known = (await findTermsByKeys(db, names.map(lookupKey))).filter(
    (t) => t.kind === body.kind,
  );
  if (known.length) {
    const t = known[0]!;
    throw new ConflictError(`"${body.name}" is already in the vocabulary as ${t.id} (${t.name})`, {
      termId: t.merged_into ?? t.id,
    });
  }
  try {
    const id = await db.transaction().execute(async (trx) => {
      const id = await insertProposal(trx, {
        kind: body.kind,
        name: body.name,
        abbreviations: body.abbreviations,
        synonyms: body.synonyms,
        formula: body.formula ?? null,
        note: body.note ?? null,
        proposerId: user.id,
      });
      await insertAuditEvent(trx, {
        actorId: user.id,
        action: 'vocabulary.propose',
        subjectType: 'vocabulary-proposal',
        subjectId: id,
        details: { kind: body.kind, name: body.name },
      });
      return id;
    });
    return toProposal((await getProposal(db, id))!);
  } catch (e) {
    if (isUniqueViolation(e))
      throw new ConflictError(`a ${body.kind} named "${body.name}" is already proposed`);
    throw e;
  }
}

/** Curators see every proposal; contributors see their own. */
export async function listProposals(
  db: Db,
  principal: Principal,
  q: z.output<typeof proposalsQuery>,
): Promise<{ total: number; items: ProposalView[] }> {
  const all = can(principal, 'vocabulary.decide', null);
  if (!all) authorize(principal, 'vocabulary.propose', null);
  const user = requireUser(principal);
  const { rows, total } = await listProposalRows(
    db,
    {
      ...(q.status !== 'all' ? { status: q.status } : {}),
      ...(all ? {} : { proposerId: user.id }),
    },
    { limit: q.limit, offset: q.offset },
  );
  return { total, items: rows.map(toProposal) };
}

/** A term id made from a name: lower case, runs of other characters turned into one hyphen. */
export function termIdFrom(name: string): string {
  const id = lookupKey(name)
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9.+]+/g, '-')
    .replace(/^[^a-z0-9]+|-+$/g, '')
    .slice(0, 80);
  return id || 'term';
}

/** Accepts (the term is created) or rejects a proposal; 409 "already decided by …" for the second curator. */
export async function decideProposal(
  db: Db,
  principal: Principal,
  id: string,
  body: z.output<typeof proposalDecisionBody>,
): Promise<ProposalView> {
  authorize(principal, 'vocabulary.decide', null);
  const user = requireUser(principal);
  if (!UUID.test(id)) throw new NotFoundError('proposal');
  await db.transaction().execute(async (trx) => {
    const p = await getProposal(trx, id, { lock: true });
    if (!p) throw new NotFoundError('proposal');
    if (p.status !== 'proposed')
      throw new ConflictError(
        `already decided by ${p.decided_by ?? 'another curator'}: ${p.status}`,
        { decidedBy: p.decided_by, proposalStatus: p.status },
      );
    let termId: string | null = null;
    if (body.decision === 'accept') {
      termId = body.termId ?? termIdFrom(p.name);
      if ((await getTermsByIds(trx, [termId])).length)
        throw new ValidationError([
          { path: 'termId', message: `a term with the id ${termId} exists; give another id` },
        ]);
      const clash = (await findTermsByKeys(trx, [lookupKey(p.name)])).find(
        (t) => t.kind === p.kind,
      );
      if (clash)
        throw new ConflictError(
          `the vocabulary gained "${p.name}" meanwhile (${clash.id}); reject this proposal or merge`,
        );
      const term = {
        id: termId,
        name: p.name,
        abbreviations: p.abbreviations,
        synonyms: p.synonyms,
      };
      await insertTerm(trx, {
        ...term,
        kind: p.kind,
        lookupKeys: termKeys(term),
        formula: p.formula,
      });
    }
    if (
      !(await decideProposalRow(trx, id, {
        status: body.decision === 'accept' ? 'accepted' : 'rejected',
        by: user.id,
        reason: body.reason ?? null,
        termId,
      }))
    ) {
      throw new ConflictError('someone decided this proposal first; reload it');
    }
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: `vocabulary.${body.decision}`,
      subjectType: 'vocabulary-proposal',
      subjectId: id,
      details: {
        name: p.name,
        kind: p.kind,
        ...(termId ? { termId } : {}),
        ...(body.reason ? { reason: body.reason } : {}),
      },
    });
    await queueMail(trx, {
      kind: `vocabulary.${body.decision === 'accept' ? 'accepted' : 'rejected'}`,
      to: p.proposer_email,
      subject: `Your proposed ${p.kind} "${p.name}" was ${body.decision === 'accept' ? 'accepted' : 'not accepted'}`,
      text:
        (body.decision === 'accept'
          ? `A curator added "${p.name}" to the vocabulary as ${termId}. You can use it in your records now.`
          : `A curator did not add "${p.name}" to the vocabulary.`) +
        (body.reason ? `\n\nReason: ${body.reason}` : '') +
        SIGNATURE,
    });
  });
  wakeOutbox();
  return toProposal((await getProposal(db, id))!);
}

/**
 * Merges a duplicate term into another of the same kind: the duplicate's names become synonyms
 * of the survivor, the duplicate points at it, and every record naming the duplicate gets a new
 * version naming the survivor. One transaction.
 */
export async function mergeTerms(
  db: Db,
  principal: Principal,
  body: z.output<typeof mergeBody>,
): Promise<MergeResult> {
  authorize(principal, 'vocabulary.edit', null);
  const user = requireUser(principal);
  if (body.from === body.into)
    throw new ValidationError([{ path: 'into', message: 'a term cannot be merged into itself' }]);
  const records = await db.transaction().execute(async (trx) => {
    // Lock in a fixed order so two merges of the same pair cannot deadlock.
    const [a, b] = [body.from, body.into].sort();
    const locked = new Map([
      [a!, await lockTerm(trx, a!)],
      [b!, await lockTerm(trx, b!)],
    ]);
    const from = locked.get(body.from);
    const into = locked.get(body.into);
    if (!from) throw new ValidationError([{ path: 'from', message: `no term ${body.from}` }]);
    if (!into) throw new ValidationError([{ path: 'into', message: `no term ${body.into}` }]);
    if (from.merged_into)
      throw new ConflictError(`${from.id} was already merged into ${from.merged_into}`);
    if (into.merged_into)
      throw new ValidationError([
        {
          path: 'into',
          message: `${into.id} was merged into ${into.merged_into}; merge into that term`,
        },
      ]);
    if (from.kind !== into.kind)
      throw new ValidationError([
        { path: 'into', message: `${from.id} is a ${from.kind}, ${into.id} a ${into.kind}` },
      ]);
    if (from.kind === 'reference-electrode' && from.scale !== into.scale) {
      throw new ValidationError([
        {
          path: 'into',
          message: `reference electrodes on different scales (${from.scale ?? 'none'}, ${into.scale ?? 'none'}) are not duplicates`,
        },
      ]);
    }
    const own = new Set([into.name, ...into.abbreviations, ...into.synonyms].map(lookupKey));
    const synonyms = [...into.synonyms];
    for (const n of [from.name, ...from.abbreviations, ...from.synonyms]) {
      if (!own.has(lookupKey(n))) {
        synonyms.push(n);
        own.add(lookupKey(n));
      }
    }
    const lookupKeys = [
      ...new Set([
        ...termKeys({
          id: into.id,
          name: into.name,
          abbreviations: into.abbreviations,
          synonyms,
          scale: into.scale ?? undefined,
        }),
        ...from.lookup_keys,
      ]),
    ];
    await setTermNames(trx, into.id, { synonyms, lookupKeys });
    await markMerged(trx, from.id, into.id);
    const changed: { handle: string; version: number }[] = [];
    for (const recordId of await recordsNamingTerm(trx, from.id)) {
      const r = await refreshRecordTerms(
        trx,
        user.id,
        recordId,
        `Vocabulary: "${from.name}" merged into "${into.name}"`,
      );
      if (r) changed.push(r);
    }
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'vocabulary.merge',
      subjectType: 'vocabulary-term',
      subjectId: from.id,
      details: { from: from.id, into: into.id, records: changed.map((c) => c.handle) },
    });
    return changed;
  });
  const terms = await getTermsByIds(db, [body.from, body.into]);
  const byId = new Map(terms.map((t) => [t.id, toTerm(t)]));
  return { from: byId.get(body.from)!, into: byId.get(body.into)!, records };
}

function toValue(r: Awaited<ReturnType<typeof referenceValues>>[number]): ReferenceValueView {
  return {
    potentialVsSheV: Number(r.potential_vs_she_v),
    tempCoefficientMVPerK:
      r.temp_coefficient_mv_per_k === null ? null : Number(r.temp_coefficient_mv_per_k),
    source: r.source,
    note: r.note,
    changedBy: r.changed_by,
    validFrom: r.valid_from.toISOString(),
  };
}

/** A reference electrode with the values it has had, newest first. */
export async function referenceHistory(
  db: Db,
  principal: Principal,
  termId: string,
): Promise<{ term: VocabularyTerm; values: ReferenceValueView[] }> {
  authorize(principal, 'vocabulary.read', null);
  const [t] = await getTermsByIds(db, [termId]);
  if (!t || t.kind !== 'reference-electrode') throw new NotFoundError('reference electrode');
  const values = (await referenceValues(db, t.id)).map(toValue);
  // Before its first revision, the term's own value is its whole history.
  if (values.length === 0 && t.potential_vs_she_v !== null) {
    values.push({
      potentialVsSheV: Number(t.potential_vs_she_v),
      tempCoefficientMVPerK:
        t.temp_coefficient_mv_per_k === null ? null : Number(t.temp_coefficient_mv_per_k),
      source: t.potential_source ?? 'not recorded',
      note: null,
      changedBy: null,
      validFrom: t.created_at.toISOString(),
    });
  }
  return { term: toTerm(t), values };
}

/**
 * Revises a reference electrode's potential vs SHE with its source. New versions compute with it;
 * existing versions keep the offset they were computed with and show that a newer value exists.
 */
export async function editReferenceValue(
  db: Db,
  principal: Principal,
  termId: string,
  body: z.output<typeof referenceValueBody>,
): Promise<{ term: VocabularyTerm; values: ReferenceValueView[] }> {
  authorize(principal, 'vocabulary.edit', null);
  const user = requireUser(principal);
  await db.transaction().execute(async (trx) => {
    const t = await lockTerm(trx, termId);
    if (!t || t.kind !== 'reference-electrode') throw new NotFoundError('reference electrode');
    if (t.merged_into)
      throw new ConflictError(`${t.id} was merged into ${t.merged_into}; edit that term`);
    if (t.scale === 'RHE' || t.scale === 'Fc+/Fc') {
      throw new ValidationError([
        {
          path: 'potentialVsSheV',
          message: `the ${t.scale} scale has no fixed potential (it depends on the electrolyte)`,
        },
      ]);
    }
    const history = await referenceValues(trx, t.id);
    if (history.length === 0 && t.potential_vs_she_v !== null) {
      // Keep the value in force until now as the first entry of the history.
      await insertReferenceValue(trx, {
        termId: t.id,
        potentialVsSheV: Number(t.potential_vs_she_v),
        tempCoefficientMVPerK:
          t.temp_coefficient_mv_per_k === null ? null : Number(t.temp_coefficient_mv_per_k),
        source: t.potential_source ?? 'not recorded',
        note: null,
        changedBy: null,
        validFrom: t.created_at,
      });
    }
    const temp =
      body.tempCoefficientMVPerK ??
      (t.temp_coefficient_mv_per_k === null ? null : Number(t.temp_coefficient_mv_per_k));
    await insertReferenceValue(trx, {
      termId: t.id,
      potentialVsSheV: body.potentialVsSheV,
      tempCoefficientMVPerK: temp,
      source: body.source,
      note: body.note ?? null,
      changedBy: user.id,
    });
    await setReferencePotential(trx, t.id, {
      potentialVsSheV: body.potentialVsSheV,
      tempCoefficientMVPerK: temp,
      source: body.source,
    });
    await insertAuditEvent(trx, {
      actorId: user.id,
      action: 'vocabulary.reference-value',
      subjectType: 'vocabulary-term',
      subjectId: t.id,
      details: {
        before: t.potential_vs_she_v === null ? null : Number(t.potential_vs_she_v),
        after: body.potentialVsSheV,
        source: body.source,
      },
    });
  });
  return referenceHistory(db, principal, termId);
}
