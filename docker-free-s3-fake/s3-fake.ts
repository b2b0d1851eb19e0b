// A local stand-in for S3: the s3rver package on loopback, objects kept in a folder.
// The app reaches it only through @aws-sdk/client-s3, so a real bucket works by configuration.
import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';

export interface S3Fake {
  endpoint: string;
  port: number;
  close(): Promise<void>;
}

/** CORS so a browser page on another origin can PUT to a presigned URL and read the ETag. */
const cors = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

/** Starts the fake on 127.0.0.1 (port 0 picks a free one) with the bucket created. */
export async function startS3Fake(opts: {
  port: number;
  directory: string;
  bucket: string;
  /** Prefixes (ending in "/") whose folder must never vanish under concurrent PUTs. */
  keepPrefixes?: string[];
}): Promise<S3Fake> {
  mkdirSync(opts.directory, { recursive: true });
  const server = new S3rver({
    port: opts.port,
    address: '127.0.0.1',
    directory: opts.directory,
    silent: true,
    configureBuckets: [{ name: opts.bucket, configs: [cors] }],
  });
  const address = (await server.run()) as { port: number };
  // s3rver removes a folder when its last object is deleted, and a PUT into that folder at the
  // same moment then fails with a 500. Real S3 has no folders; a placeholder in each prefix
  // the app deletes from keeps the fake's folder in place.
  for (const prefix of opts.keepPrefixes ?? []) {
    const res = await fetch(`http://127.0.0.1:${address.port}/${opts.bucket}/${prefix}.keep`, {
      method: 'PUT',
      body: '',
    });
    if (!res.ok) throw new Error(`s3 fake: placeholder in ${prefix} not stored (${res.status})`);
  }
  return {
    port: address.port,
    endpoint: `http://127.0.0.1:${address.port}`,
    close: () => server.close() as Promise<void>,
  };
}
