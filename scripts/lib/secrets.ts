import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { dataDir } from './paths.ts';

/** A random secret generated on first use and kept in .data/ (mode 600) for later runs. */
export function localSecret(name: string): string {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, name);
  if (!existsSync(file)) {
    try {
      writeFileSync(file, randomBytes(32).toString('hex'), { mode: 0o600, flag: 'wx' });
    } catch (err) {
      // Another process created it a moment ago: use theirs.
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
  }
  return readFileSync(file, 'utf8').trim();
}
