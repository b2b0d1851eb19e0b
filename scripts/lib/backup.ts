// Backups: a pg_dump of the database plus a manifest of the stored objects (key, size, SHA-256),
// and the way back: pg_restore into a database of a (possibly fresh) cluster, then a check that
// every object the manifest names is in storage with its size and SHA-256.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { getObjectBytes, listObjects } from '#lib/server/storage.ts';
import { pgBinDir } from './postgres.ts';

export interface Manifest {
  createdAt: string;
  database: string;
  dumpFile: string;
  dumpSha256: string;
  objects: { key: string; size: number; sha256: string }[];
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

function run(bin: string, args: string[]) {
  const r = spawnSync(path.join(pgBinDir(), bin), args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${bin} failed: ${r.stderr || r.stdout}`);
}

/** Dumps the database (custom format) and writes FILE.manifest.json beside it. */
export async function backup(opts: {
  adminUrl: string;
  database: string;
  file: string;
}): Promise<Manifest> {
  run('pg_dump', ['--format=custom', '--no-password', `--file=${opts.file}`, opts.adminUrl]);
  const objects = [];
  for (const o of await listObjects()) {
    const bytes = await getObjectBytes(o.key);
    if (bytes) objects.push({ key: o.key, size: bytes.byteLength, sha256: sha256(bytes) });
  }
  const manifest: Manifest = {
    createdAt: new Date().toISOString(),
    database: opts.database,
    dumpFile: path.basename(opts.file),
    dumpSha256: sha256(readFileSync(opts.file)),
    objects,
  };
  writeFileSync(manifestPath(opts.file), JSON.stringify(manifest, null, 2));
  return manifest;
}

export const manifestPath = (dumpFile: string) => `${dumpFile}.manifest.json`;

export interface RestoreReport {
  objectsChecked: number;
  missing: string[];
  changed: string[];
}

/** Restores a dump into an empty database and checks the objects its manifest names. */
export async function restore(opts: { adminUrl: string; file: string }): Promise<RestoreReport> {
  const manifest = JSON.parse(readFileSync(manifestPath(opts.file), 'utf8')) as Manifest;
  if (sha256(readFileSync(opts.file)) !== manifest.dumpSha256)
    throw new Error(`${opts.file} does not match its manifest (SHA-256 differs)`);
  run('pg_restore', ['--exit-on-error', '--no-password', `--dbname=${opts.adminUrl}`, opts.file]);
  const report: RestoreReport = { objectsChecked: 0, missing: [], changed: [] };
  for (const o of manifest.objects) {
    report.objectsChecked++;
    const bytes = await getObjectBytes(o.key);
    if (!bytes) report.missing.push(o.key);
    else if (bytes.byteLength !== o.size || sha256(bytes) !== o.sha256) report.changed.push(o.key);
  }
  return report;
}
