import { createHash } from 'node:crypto';
import { AppError } from './errors.ts';
import { log } from './log.ts';
import { getObjectBytes, PRESIGNABLE_PREFIX, putObject } from './storage.ts';

// Where raw files live in object storage, and why their bytes cannot change once verified.
//
// A browser PUTs a declared file to a staging key (`uploads/<upload id>`) through a short-lived
// presigned URL. On `complete` the server reads the staged bytes, checks size and SHA-256, and
// writes those very bytes (never a server-side copy of the staging object, which could have been
// replaced between the check and the copy) to a key named by their hash, `raw/sha256/<hex>`.
// Only staging keys can be presigned (`presignPut` in storage.ts refuses any other key), so nobody holding
// an upload URL can reach the bytes a record points at; the staging object is then removed.
// Identical files share one sealed object, which is harmless because its key is its content.

export const STAGING_PREFIX = PRESIGNABLE_PREFIX;
const SEALED_PREFIX = 'raw/sha256/';

/** The staging key an upload's presigned URL names. */
export const stagingKey = (uploadId: string) => `${STAGING_PREFIX}${uploadId}`;

/** The content-addressed key of verified bytes. */
export const sealedKey = (sha256: string) => `${SEALED_PREFIX}${sha256}`;

/**
 * Stores bytes whose SHA-256 the caller has just verified under their content-addressed key,
 * with the hash and size as object metadata; returns the key.
 */
export async function sealVerifiedBytes(
  bytes: Uint8Array,
  sha256: string,
  mediaType: string,
): Promise<string> {
  const key = sealedKey(sha256);
  await putObject(key, bytes, mediaType, { sha256, size: String(bytes.byteLength) });
  return key;
}

/** The stored bytes differ from what was verified: never served as if they were the record's file. */
export class RawFileIntegrityError extends AppError {
  constructor(detail: string) {
    super(500, 'Stored file failed its check', detail);
  }
}

/**
 * A raw file's bytes, re-checked against the size and SHA-256 recorded when it was verified
 * (hashing is cheap next to reading the object); null when the object is missing.
 */
export async function readVerifiedRawFile(f: {
  object_key: string;
  bytes: number | string;
  sha256: string;
}): Promise<Uint8Array | null> {
  const bytes = await getObjectBytes(f.object_key);
  if (!bytes) return null;
  const sha = createHash('sha256').update(bytes).digest('hex');
  if (bytes.byteLength !== Number(f.bytes) || sha !== f.sha256) {
    log().error(
      { key: f.object_key, bytes: bytes.byteLength, sha256: sha, recorded: f.sha256 },
      'stored raw file no longer matches its recorded size and SHA-256',
    );
    throw new RawFileIntegrityError(
      'The stored raw file no longer matches the SHA-256 recorded when it was verified; it is not served.',
    );
  }
  return bytes;
}
