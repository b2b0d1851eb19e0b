// Plain Node (no dependencies): runs before node_modules exists on a fresh clone.
// Installs the npm dependencies from the lockfile and the Debian packages the project needs.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

const log = (msg) => console.log(`[edgewise] ${msg}`);

/** `npm ci` when node_modules is missing or older than the lockfile. */
export function ensureNodeModules() {
  const lock = path.join(root, 'package-lock.json');
  const marker = path.join(root, 'node_modules', '.package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  log('installing npm dependencies (npm ci)…');
  const started = Date.now();
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('npm ci failed');
  log(`dependencies installed in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

function hasDebPackage(name) {
  const r = spawnSync('dpkg-query', ['-W', '-f=${Status}', name], { encoding: 'utf8' });
  return r.status === 0 && r.stdout.includes('install ok installed');
}

/** apt-get install the named Debian packages that are missing (as root; PostgreSQL, Chromium). */
export function ensureDebianPackages(names) {
  const missing = names.filter((n) => !hasDebPackage(n));
  if (missing.length === 0) return;
  if (process.getuid?.() !== 0) {
    throw new Error(
      `missing Debian packages: ${missing.join(', ')} — install them with apt-get (root needed)`,
    );
  }
  log(`installing Debian packages: ${missing.join(', ')}…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...missing], {
    stdio: 'inherit',
    env,
  });
}

export const SERVER_PACKAGES = ['postgresql', 'postgresql-contrib'];
export const BROWSER_PACKAGES = ['chromium', 'fonts-dejavu-core'];

/** Runs a TypeScript entry point with the project's tsx, forwarding signals and the exit code. */
export function runTs(script, args = [], env = process.env) {
  const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
  const r = spawnSync(tsx, [script, ...args], { cwd: root, stdio: 'inherit', env });
  return r.status ?? 1;
}
