import { createHash, randomBytes } from 'node:crypto';
import { describe, expect, it, inject } from 'vitest';
import {
  getObjectBytes,
  objectSize,
  presignPut,
  putObject,
  deleteObject,
} from '#lib/server/storage.ts';

describe('object storage through the S3 SDK against the local fake', () => {
  it('stores bytes and reads back exactly the same bytes', async () => {
    const bytes = randomBytes(256 * 1024);
    const key = `test/${randomBytes(8).toString('hex')}.bin`;
    await putObject(key, bytes, 'application/octet-stream');
    const back = await getObjectBytes(key);
    expect(back).not.toBeNull();
    expect(createHash('sha256').update(back!).digest('hex')).toBe(
      createHash('sha256').update(bytes).digest('hex'),
    );
    expect(await objectSize(key)).toBe(bytes.length);
    await deleteObject(key);
    expect(await getObjectBytes(key)).toBeNull();
    expect(await objectSize(key)).toBeNull();
  });

  it('accepts a PUT to a presigned URL, as a browser upload does, without altering the body', async () => {
    // Only staging keys under uploads/ can be presigned (verified files live elsewhere).
    const key = `uploads/${randomBytes(8).toString('hex')}.csv`;
    const body = 'time/s;E/V;I/mA\r\n0;0,100;0,0123\r\n';
    const url = await presignPut(key, 'text/csv', 60);
    expect(url).toContain('X-Amz-Signature=');
    expect(url).not.toMatch(/x-amz-checksum/i);
    const res = await fetch(url, { method: 'PUT', body, headers: { 'content-type': 'text/csv' } });
    expect(res.status).toBe(200);
    expect(new TextDecoder().decode((await getObjectBytes(key))!)).toBe(body);
  });

  it('answers a browser preflight from the app origin', async () => {
    const endpoint = inject('appEnv').S3_ENDPOINT!;
    const res = await fetch(`${endpoint}/edgewise-raw/test/preflight.csv`, {
      method: 'OPTIONS',
      headers: {
        origin: inject('appUrl'),
        'access-control-request-method': 'PUT',
        'access-control-request-headers': 'content-type',
      },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('access-control-allow-methods')).toMatch(/PUT/);
  });
});
