import {
  CopyObjectCommand,
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { config } from './config.ts';

// The only place that talks to object storage. Any S3-compatible store works by configuration.

let client: S3Client | undefined;

function s3(): S3Client {
  const c = config();
  client ??= new S3Client({
    endpoint: c.S3_ENDPOINT,
    region: c.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: c.S3_ACCESS_KEY_ID, secretAccessKey: c.S3_SECRET_ACCESS_KEY },
    // Checksums only when an operation requires them: otherwise streamed bodies are stored
    // with their chunk framing by simple S3 stand-ins, and presigned URLs carry extra parameters.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 2,
    // A store that accepts connections and then says nothing must not hold a request: give up
    // connecting after CONNECT_TIMEOUT_MS and on a socket silent for SILENCE_TIMEOUT_MS (bodies
    // that keep arriving are not cut off); `send` below bounds each call's wait for an answer.
    requestHandler: { connectionTimeout: CONNECT_TIMEOUT_MS, requestTimeout: SILENCE_TIMEOUT_MS },
  });
  return client;
}

/** Timeouts of every storage call (ms): connecting, a silent socket, and waiting for an answer. */
export const CONNECT_TIMEOUT_MS = 2_000;
export const SILENCE_TIMEOUT_MS = 6_000;
export const ANSWER_TIMEOUT_MS = 8_000;

/**
 * Runs one storage call with a bound on the wait for its answer (all attempts together), so a
 * frozen store costs a request at most ANSWER_TIMEOUT_MS before it becomes a 503 with Retry-After.
 * The bound ends when the answer starts: a body still streaming is bounded by the silence timeout.
 */
async function bounded<T>(call: (abortSignal: AbortSignal) => Promise<T>): Promise<T> {
  const abort = new AbortController();
  const timer = setTimeout(
    () => abort.abort(new Error(`no answer within ${ANSWER_TIMEOUT_MS} ms`)),
    ANSWER_TIMEOUT_MS,
  );
  try {
    return await call(abort.signal);
  } finally {
    clearTimeout(timer);
  }
}

export class StorageUnavailableError extends Error {
  readonly code = 'storage-unavailable';
}

function unavailable(err: unknown): never {
  throw new StorageUnavailableError(
    `object storage unavailable: ${err instanceof Error ? err.message : String(err)}`,
  );
}

const bucket = () => config().S3_BUCKET;

/** Stores bytes under a key, with optional metadata. */
export async function putObject(
  key: string,
  body: Uint8Array | string,
  contentType: string,
  metadata?: Record<string, string>,
): Promise<void> {
  await bounded((abortSignal) =>
    s3().send(
      new PutObjectCommand({
        Bucket: bucket(),
        Key: key,
        Body: body,
        ContentType: contentType,
        Metadata: metadata,
      }),
      { abortSignal },
    ),
  ).catch(unavailable);
}

/** Reads a whole object, or null when it does not exist. */
export async function getObjectBytes(key: string): Promise<Uint8Array | null> {
  try {
    const out = await bounded((abortSignal) =>
      s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }), { abortSignal }),
    );
    return out.Body ? await out.Body.transformToByteArray() : new Uint8Array();
  } catch (err) {
    if (isNotFound(err)) return null;
    unavailable(err);
  }
}

/** Size in bytes of an object, or null when it does not exist. */
export async function objectSize(key: string): Promise<number | null> {
  try {
    const out = await bounded((abortSignal) =>
      s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }), { abortSignal }),
    );
    return out.ContentLength ?? 0;
  } catch (err) {
    if (isNotFound(err)) return null;
    unavailable(err);
  }
}

/**
 * Copies an object inside the bucket (server side, the bytes never pass through us), with
 * metadata of the caller's choosing on the copy and the source's content type.
 */
export async function copyObject(
  fromKey: string,
  toKey: string,
  metadata: Record<string, string>,
): Promise<void> {
  await bounded((abortSignal) =>
    s3().send(
      new CopyObjectCommand({
        Bucket: bucket(),
        Key: toKey,
        CopySource: `${bucket()}/${fromKey.split('/').map(encodeURIComponent).join('/')}`,
        MetadataDirective: 'REPLACE',
        Metadata: metadata,
      }),
      { abortSignal },
    ),
  ).catch(unavailable);
}

/** An object's stored metadata (lower-case names), or null when it does not exist. */
export async function objectMetadata(key: string): Promise<Record<string, string> | null> {
  try {
    const out = await bounded((abortSignal) =>
      s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }), { abortSignal }),
    );
    return { ...(out.Metadata ?? {}), 'content-length': String(out.ContentLength ?? 0) };
  } catch (err) {
    if (isNotFound(err)) return null;
    unavailable(err);
  }
}

export async function deleteObject(key: string): Promise<void> {
  await bounded((abortSignal) =>
    s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }), { abortSignal }),
  ).catch(unavailable);
}

/** Every object under a prefix: key and size (backups, cleanup). */
export async function listObjects(prefix = ''): Promise<{ key: string; size: number }[]> {
  const out: { key: string; size: number }[] = [];
  let token: string | undefined;
  do {
    const page = await bounded((abortSignal) =>
      s3().send(
        new ListObjectsV2Command({
          Bucket: bucket(),
          Prefix: prefix || undefined,
          ContinuationToken: token,
        }),
        { abortSignal },
      ),
    ).catch(unavailable);
    for (const o of page.Contents ?? []) if (o.Key) out.push({ key: o.Key, size: o.Size ?? 0 });
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return out;
}

/** The only keys a presigned URL may name (see raw-objects.ts: verified bytes live elsewhere). */
export const PRESIGNABLE_PREFIX = 'uploads/';

/** A short-lived URL the browser can PUT the object to; the content type is part of the signature. */
export async function presignPut(
  key: string,
  contentType: string,
  expiresInSeconds = 600,
): Promise<string> {
  if (!key.startsWith(PRESIGNABLE_PREFIX) || key.includes('..'))
    throw new Error(`refusing to presign ${key}: only ${PRESIGNABLE_PREFIX} keys are writable`);
  return getSignedUrl(
    s3(),
    new PutObjectCommand({ Bucket: bucket(), Key: key, ContentType: contentType }),
    {
      expiresIn: expiresInSeconds,
      signableHeaders: new Set(['content-type']),
    },
  );
}

/** Creates the bucket when it is missing (start-up of local and test setups). */
export async function ensureBucket(): Promise<void> {
  try {
    await bounded((abortSignal) =>
      s3().send(new HeadBucketCommand({ Bucket: bucket() }), { abortSignal }),
    );
  } catch (err) {
    if (!isNotFound(err)) unavailable(err);
    await bounded((abortSignal) =>
      s3().send(new CreateBucketCommand({ Bucket: bucket() }), { abortSignal }),
    );
  }
}

/** True when the bucket answers. */
export async function pingStorage(): Promise<boolean> {
  try {
    await s3().send(new HeadBucketCommand({ Bucket: bucket() }), {
      abortSignal: AbortSignal.timeout(2_000),
    });
    return true;
  } catch {
    return false;
  }
}

function isNotFound(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return (
    e?.name === 'NotFound' ||
    e?.name === 'NoSuchKey' ||
    e?.name === 'NoSuchBucket' ||
    e?.$metadata?.httpStatusCode === 404
  );
}
