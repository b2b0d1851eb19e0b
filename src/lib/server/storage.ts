import {
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
  });
  return client;
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

/** Stores bytes under a key. */
export async function putObject(
  key: string,
  body: Uint8Array | string,
  contentType: string,
): Promise<void> {
  await s3()
    .send(
      new PutObjectCommand({ Bucket: bucket(), Key: key, Body: body, ContentType: contentType }),
    )
    .catch(unavailable);
}

/** Reads a whole object, or null when it does not exist. */
export async function getObjectBytes(key: string): Promise<Uint8Array | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    return out.Body ? await out.Body.transformToByteArray() : new Uint8Array();
  } catch (err) {
    if (isNotFound(err)) return null;
    unavailable(err);
  }
}

/** Size in bytes of an object, or null when it does not exist. */
export async function objectSize(key: string): Promise<number | null> {
  try {
    const out = await s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }));
    return out.ContentLength ?? 0;
  } catch (err) {
    if (isNotFound(err)) return null;
    unavailable(err);
  }
}

export async function deleteObject(key: string): Promise<void> {
  await s3()
    .send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }))
    .catch(unavailable);
}

/** Every object under a prefix: key and size (backups, cleanup). */
export async function listObjects(prefix = ''): Promise<{ key: string; size: number }[]> {
  const out: { key: string; size: number }[] = [];
  let token: string | undefined;
  do {
    const page = await s3()
      .send(
        new ListObjectsV2Command({
          Bucket: bucket(),
          Prefix: prefix || undefined,
          ContinuationToken: token,
        }),
      )
      .catch(unavailable);
    for (const o of page.Contents ?? []) if (o.Key) out.push({ key: o.Key, size: o.Size ?? 0 });
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return out;
}

/** A short-lived URL the browser can PUT the object to; the content type is part of the signature. */
export async function presignPut(
  key: string,
  contentType: string,
  expiresInSeconds = 600,
): Promise<string> {
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
    await s3().send(new HeadBucketCommand({ Bucket: bucket() }));
  } catch (err) {
    if (!isNotFound(err)) unavailable(err);
    await s3().send(new CreateBucketCommand({ Bucket: bucket() }));
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
