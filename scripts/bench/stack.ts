// The app with its services for a benchmark: a database of its own, both fakes, a build in
// .data/bench/, the server on a free port. Nothing here is timed.
import type { ChildProcess } from 'node:child_process';
import path from 'node:path';
import { loadVocabularySeed } from '../../seed/load-vocabulary.ts';
import { dataDir } from '../lib/paths.ts';
import {
  appEnv,
  buildApp,
  freePort,
  prepareDatabase,
  startApp,
  startFakes,
  type Fakes,
} from '../lib/services.ts';

export interface BenchStack {
  url: string;
  env: Record<string, string>;
  adminUrl: string;
  /** One more server of the same build and services, with settings of its own. */
  another(settings: Record<string, string>): Promise<{ url: string; stop(): void }>;
  stop(): Promise<void>;
}

export async function startBenchStack(
  database = 'edgewise_bench',
  opts: { fresh?: boolean } = {},
): Promise<BenchStack> {
  const work = path.join(dataDir, 'bench');
  const cluster = await prepareDatabase(database, { fresh: opts.fresh ?? false, quiet: true });
  await loadVocabularySeed(cluster.appUrl(database));
  const fakes: Fakes = await startFakes({
    s3Port: 0,
    smtpPort: 0,
    s3Dir: path.join(work, 's3'),
    mailDir: path.join(work, 'mail'),
    bucket: 'edgewise-raw',
  });
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  // As deployed: no run-time check of every answer against its schema (APP_ENV=test does that).
  const env = appEnv({ cluster, database, fakes, origin: url, appEnv: 'development' });
  buildApp(path.join(work, 'dist'), true);
  const app: ChildProcess = await startApp(path.join(work, 'dist'), env, port, true);
  return {
    url,
    env,
    adminUrl: cluster.adminUrl(database),
    another: async (settings) => {
      const p = await freePort();
      const child = await startApp(path.join(work, 'dist'), { ...env, ...settings }, p, true);
      return { url: `http://127.0.0.1:${p}`, stop: () => void child.kill('SIGTERM') };
    },
    stop: async () => {
      app.kill('SIGTERM');
      await fakes.close();
    },
  };
}

/** Percentile of a sample (nearest rank). */
export function percentile(xs: number[], p: number): number {
  const v = [...xs].sort((a, b) => a - b);
  return v[Math.min(v.length - 1, Math.max(0, Math.ceil((p / 100) * v.length) - 1))]!;
}

/** One result line: what, figure, target, verdict. */
export function report(what: string, figure: string, target: string, ok: boolean): void {
  console.log(
    `${ok ? 'meets ' : 'MISSES'}  ${what.padEnd(44)} ${figure.padEnd(22)} target ${target}`,
  );
}
