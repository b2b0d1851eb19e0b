import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
/** Local state (database cluster, stored objects, captured mail, secrets); git-ignored. */
export const dataDir = process.env.EDGEWISE_DATA_DIR ?? path.join(projectRoot, '.data');
