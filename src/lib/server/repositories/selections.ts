import type { Selectable } from 'kysely';
import type { SelectionTable } from '../db/schema.ts';
import type { DbOrTrx } from './audit.ts';

export type SelectionRow = Selectable<SelectionTable>;

export async function insertSelection(
  db: DbOrTrx,
  s: {
    title: string;
    description: string | null;
    creatorId: string;
    creatorName: string;
    query: string;
    criterion: string | null;
    scale: string;
  },
): Promise<{ id: string; handle: string }> {
  return db
    .insertInto('selections')
    .values({
      title: s.title,
      description: s.description,
      creator_id: s.creatorId,
      creator_name: s.creatorName,
      query: JSON.stringify({ search: s.query }),
      criterion: s.criterion,
      scale: s.scale,
    })
    .returning(['id', 'handle'])
    .executeTakeFirstOrThrow();
}

export async function insertSelectionItems(
  db: DbOrTrx,
  selectionId: string,
  items: { recordId: string; version: number; snapshot: unknown }[],
): Promise<void> {
  if (!items.length) return;
  await db
    .insertInto('selection_items')
    .values(
      items.map((it, position) => ({
        selection_id: selectionId,
        position,
        record_id: it.recordId,
        version: it.version,
        snapshot: JSON.stringify(it.snapshot),
      })),
    )
    .execute();
}

export async function getSelection(db: DbOrTrx, handle: string): Promise<SelectionRow | undefined> {
  return db.selectFrom('selections').selectAll().where('handle', '=', handle).executeTakeFirst();
}

/** The frozen items in order, each with its record's status and current version now. */
export async function selectionItems(db: DbOrTrx, selectionId: string) {
  return db
    .selectFrom('selection_items as i')
    .innerJoin('records as r', 'r.id', 'i.record_id')
    .select(['i.version', 'i.snapshot', 'r.status', 'r.current_version'])
    .where('i.selection_id', '=', selectionId)
    .orderBy('i.position')
    .execute();
}

/** Record ids of handles, in one query. */
export async function recordIdsByHandle(
  db: DbOrTrx,
  handles: string[],
): Promise<Map<string, string>> {
  if (!handles.length) return new Map();
  const rows = await db
    .selectFrom('records')
    .select(['id', 'handle'])
    .where('handle', 'in', handles)
    .execute();
  return new Map(rows.map((r) => [r.handle, r.id]));
}
