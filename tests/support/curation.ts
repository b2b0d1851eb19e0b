// Fixtures for the curator's side: submitted and flagged records, open flags, proposals and
// throwaway vocabulary terms, all made through the services or the app's own tables.
import { randomBytes } from 'node:crypto';
import { appDb } from '../auth-helpers.ts';
import { makeRecord, principal } from './records.ts';
import { proposeTerm } from '#lib/server/vocabulary-upkeep.ts';
import { termKeys } from '#lib/shared/vocabulary.ts';
import type { VocabularyKind } from '#lib/shared/vocabulary.ts';

const hex = () => randomBytes(4).toString('hex');

/** A submitted public record of a new contributor; its handle. */
export async function submittedRecord(): Promise<string> {
  return (await makeRecord({ status: 'submitted' })).record.handle;
}

/** A published record flagged by a new reader; the open flag's id and the record's handle. */
export async function openFlag(): Promise<{ flag: string; handle: string }> {
  const { record } = await makeRecord({ status: 'flagged' });
  const f = await appDb()
    .selectFrom('flags as f')
    .innerJoin('records as r', 'r.id', 'f.record_id')
    .select('f.id')
    .where('r.handle', '=', record.handle)
    .where('f.status', '=', 'open')
    .executeTakeFirstOrThrow();
  return { flag: f.id, handle: record.handle };
}

/** An open proposal of a new contributor; its id. */
export async function openProposal(): Promise<string> {
  const who = await principal({ role: 'contributor' });
  return (
    await proposeTerm(appDb(), who, {
      kind: 'additive',
      name: `proposed additive ${hex()}`,
      abbreviations: [],
      synonyms: [],
    })
  ).id;
}

/** A throwaway term straight in the vocabulary; its id. */
export async function freshTerm(
  kind: VocabularyKind,
  over: {
    name?: string;
    abbreviations?: string[];
    synonyms?: string[];
    scale?: string;
    potentialVsSheV?: number;
    source?: string;
  } = {},
): Promise<string> {
  const id = `t-${kind.slice(0, 4)}-${hex()}`;
  const name = over.name ?? `Test ${kind} ${id}`;
  const t = { id, name, abbreviations: over.abbreviations ?? [], synonyms: over.synonyms ?? [] };
  await appDb()
    .insertInto('vocabulary_terms')
    .values({
      ...t,
      kind,
      // The scale name is left out of the keys: "SCE" must keep naming the seeded term alone.
      lookup_keys: termKeys(t),
      scale: over.scale ?? null,
      potential_vs_she_v: over.potentialVsSheV ?? null,
      potential_source:
        over.potentialVsSheV !== undefined
          ? (over.source ?? 'an invented handbook, table 1')
          : null,
    })
    .execute();
  return id;
}
