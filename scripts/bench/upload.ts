// Benchmark (not a test): a ~50 MB raw export through the whole upload path — checksum, declare,
// PUT to the presigned URL, complete (the server re-reads, verifies and analyses it) — while
// another client keeps reading, to show the server stays responsive.
// Usage: npm run bench:upload [-- --mb 50]
import { createHash, randomBytes } from 'node:crypto';
import { parseArgs } from 'node:util';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { createDb } from '#lib/server/db/index.ts';
import { percentile, report, startBenchStack } from './stack.ts';

const { values } = parseArgs({ options: { mb: { type: 'string', default: '50' } } });
const TARGET_S = 5;

async function main() {
  // A window-opening CV sampled finely enough to reach the size asked for.
  const want = Number(values.mb) * 1024 * 1024;
  let interval = 0.01;
  let text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: interval }));
  interval *= text.length / want;
  text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: interval }));
  const bytes = Buffer.from(text);
  console.log(
    `file: ${(bytes.byteLength / 1024 / 1024).toFixed(1)} MB, ${text.split('\n').length - 1} rows`,
  );

  const stack = await startBenchStack('edgewise_bench_upload', { fresh: true });
  const db = createDb(stack.adminUrl, 2);
  try {
    const { createToken } = await import('#lib/server/api-tokens.ts');
    const u = await db
      .insertInto('User')
      .values({
        email: `bench-${randomBytes(3).toString('hex')}@bench.test`,
        name: 'Bench contributor',
        role: 'contributor',
        emailVerified: new Date(),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const principal = {
      kind: 'user' as const,
      id: u.id,
      email: '',
      name: null,
      role: 'contributor' as const,
      labs: [],
      via: 'session' as const,
      scopes: ['read', 'write'] as ('read' | 'write')[],
    };
    const token = (
      await createToken(db, principal, {
        name: 'bench',
        scopes: ['read', 'write'],
        expiresInDays: 1,
      })
    ).token;
    const call = (p: string, method = 'GET', body?: unknown) =>
      fetch(stack.url + p, {
        method,
        headers: {
          authorization: `Bearer ${token}`,
          ...(body ? { 'content-type': 'application/json' } : {}),
        },
        body: body ? JSON.stringify(body) : undefined,
      });
    const { content } = await import('../../tests/support/record-content.ts');
    const rec = await (await call('/api/v1/records', 'POST', { content: content() })).json();

    // Another client reads the whole time.
    let reading = true;
    const readTimes: number[] = [];
    const reader = (async () => {
      while (reading) {
        const t0 = performance.now();
        await (
          await fetch(`${stack.url}/api/v1/records/${rec.handle}`, {
            headers: { authorization: `Bearer ${token}` },
          })
        ).arrayBuffer();
        readTimes.push(performance.now() - t0);
      }
    })();

    const t0 = performance.now();
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const t1 = performance.now();
    const ticket = await (
      await call('/api/v1/uploads', 'POST', {
        record: rec.handle,
        name: 'big-cv.csv',
        size: bytes.byteLength,
        sha256,
        mediaType: 'text/csv',
      })
    ).json();
    const t2 = performance.now();
    const put = await fetch(ticket.url, { method: 'PUT', body: bytes, headers: ticket.headers });
    if (!put.ok) throw new Error(`PUT ${put.status}`);
    const t3 = performance.now();
    const done = await call(`/api/v1/uploads/${ticket.id}/complete`, 'POST');
    if (!done.ok) throw new Error(`complete ${done.status}: ${await done.text()}`);
    const out = await done.json();
    const t4 = performance.now();
    reading = false;
    await reader;

    console.log(
      `steps: SHA-256 ${(t1 - t0).toFixed(0)} ms, declare ${(t2 - t1).toFixed(0)} ms, PUT ${(t3 - t2).toFixed(0)} ms, verify + analyse ${(t4 - t3).toFixed(0)} ms; evidence ${out.record.evidenceLevel}`,
    );
    const total = (t4 - t0) / 1000;
    report(
      '50 MB upload end to end',
      `${total.toFixed(2)} s`,
      `≤ ${TARGET_S} s`,
      total <= TARGET_S,
    );
    report(
      `reads answered meanwhile (${readTimes.length})`,
      `p95 ${percentile(readTimes, 95).toFixed(0)} ms`,
      'answered',
      readTimes.length > 0,
    );
    report('slowest read meanwhile', `${Math.max(...readTimes).toFixed(0)} ms`, '—', true);
  } finally {
    await db.destroy();
    await stack.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
