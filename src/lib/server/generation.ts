import type { Kysely } from 'kysely';
import type { Database } from './db/schema.ts';
import { searchGeneration } from './repositories/records.ts';
import { sharedReads } from './shared-reads.ts';

// What is held per generation of the collection: a committed change to record_search, labs or
// reviews moves `search_generation`, and whatever was computed at another generation is not
// served again.

/**
 * Answers kept per generation (see `searchGeneration`), for the two generations asked for last:
 * a replica a moment behind the primary and the primary itself may both be read while a change
 * replays, and neither should drop the other's answers. An answer is never served for data or a
 * day it was not computed on. Least recently used entries go first; concurrent misses on one key
 * share one computation.
 */
export class GenerationCache<T> {
  private readonly generations = new Map<string, Map<string, Promise<T>>>();
  constructor(private readonly size: number) {}

  get(generation: string, key: string, compute: () => Promise<T>): Promise<T> {
    let entries = this.generations.get(generation);
    if (entries) {
      this.generations.delete(generation);
    } else {
      entries = new Map();
      if (this.generations.size >= 2)
        this.generations.delete(this.generations.keys().next().value!);
    }
    this.generations.set(generation, entries);
    let entry = entries.get(key);
    if (entry) {
      entries.delete(key); // re-inserted below: the Map's order is least recently used first
    } else {
      const fresh = compute();
      const held = entries;
      fresh.catch(() => held.get(key) === fresh && held.delete(key));
      if (entries.size >= this.size) entries.delete(entries.keys().next().value!);
      entry = fresh;
    }
    entries.set(key, entry);
    return entry;
  }
}

const generationReaders = new WeakMap<Kysely<Database>, () => Promise<string>>();

/** The current generation of this database, read as `sharedReads` describes. */
export function currentGeneration(db: Kysely<Database>): Promise<string> {
  let reader = generationReaders.get(db);
  if (!reader) generationReaders.set(db, (reader = sharedReads(() => searchGeneration(db))));
  return reader();
}
