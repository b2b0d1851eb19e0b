import { createDb } from '../src/lib/server/db/index.ts';
import { loadVocabulary } from '../src/lib/server/vocabulary.ts';
import { VOCABULARY } from './vocabulary.ts';

/** Loads the starting vocabulary into the database at `databaseUrl`; terms already there are kept. */
export async function loadVocabularySeed(databaseUrl: string): Promise<number> {
  const db = createDb(databaseUrl, 1);
  try {
    return await loadVocabulary(db, VOCABULARY);
  } finally {
    await db.destroy();
  }
}
