// `npm test`: install what is missing (npm packages, PostgreSQL, Chromium), then run every
// test once and close with one summary line.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import {
  BROWSER_PACKAGES,
  SERVER_PACKAGES,
  ensureDebianPackages,
  ensureNodeModules,
  root,
} from './lib/bootstrap.mjs';

const started = Date.now();
ensureDebianPackages([...SERVER_PACKAGES, ...BROWSER_PACKAGES]);
ensureNodeModules();

// Static checks first: the formatter, the linter (import boundaries included) and the type check
// of every file, .astro pages too. Each one that fails counts as one failed test.
const bin = (name) => path.join(root, 'node_modules', '.bin', name);
const checks = [
  ['prettier', [bin('prettier'), '--check', '--log-level=warn', '.']],
  ['eslint', [bin('eslint'), '.']],
  ['astro check', [bin('astro'), 'check']],
];
let staticFailed = 0;
if (!process.argv.includes('--no-static')) {
  for (const [name, [cmd, ...args]] of checks) {
    const c = spawnSync(cmd, args, {
      cwd: root,
      stdio: 'inherit',
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' },
    });
    if (c.status !== 0) {
      staticFailed += 1;
      console.error(`[edgewise] ${name} failed`);
    } else console.log(`[edgewise] ${name}: clean`);
  }
}

const results = path.join(root, '.data', `test-results-${process.pid}.json`);
mkdirSync(path.dirname(results), { recursive: true });
const r = spawnSync(
  path.join(root, 'node_modules', '.bin', 'vitest'),
  [
    'run',
    '--reporter=default',
    '--reporter=json',
    `--outputFile.json=${results}`,
    ...process.argv.slice(2),
  ],
  {
    cwd: root,
    stdio: 'inherit',
    env: {
      ...process.env,
      ASTRO_TELEMETRY_DISABLED: '1',
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
    },
  },
);

let code = r.status ?? 1;
if (staticFailed > 0) code = code || 1;
if (existsSync(results)) {
  const summary = JSON.parse(readFileSync(results, 'utf8'));
  rmSync(results, { force: true });
  const passed = summary.numPassedTests ?? 0;
  // A file that failed to load or whose hooks threw ran no test of its own: it counts as one failure.
  const brokenFiles = (summary.testResults ?? []).filter(
    (f) => f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed'),
  ).length;
  const failed = (summary.numFailedTests ?? 0) + brokenFiles + staticFailed;
  if (failed > 0) code = code || 1;
  const skipped = (summary.numPendingTests ?? 0) + (summary.numTodoTests ?? 0);
  if (passed + failed === 0) code = code || 1; // a run that tested nothing is not a pass
  console.log(`\nTime: ${((Date.now() - started) / 1000).toFixed(1)} s`);
  console.log(`tests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
}
process.exit(code);
