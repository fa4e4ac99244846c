import type { Readable } from 'node:stream';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  NoSuchKey,
  NotFound,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import type { BlobStore } from './blob-store.js';

/** Where the bucket is. Credentials come from the SDK's usual sources (AWS_ACCESS_KEY_ID, AWS_SECRET_ACCESS_KEY, profiles, roles). */
export interface S3Settings {
  bucket: string;
  /** An S3-compatible server (e.g. http://127.0.0.1:9000); omitted = AWS itself. */
  endpoint: string | undefined;
  region: string;
  /** Prepended to every key, e.g. "uploads/", so one bucket can hold other things too. */
  prefix: string;
}

/**
 * Bytes in an S3-compatible bucket under `<prefix><sha256>`. Path-style addressing
 * whenever an endpoint is given: most S3-compatible servers have no per-bucket
 * host names. Checksums only where S3 requires them, as several compatible servers
 * reject the SDK's newer default checksum headers.
 */
export function createS3Store(settings: S3Settings): BlobStore {
  const client = new S3Client({
    region: settings.region,
    ...(settings.endpoint ? { endpoint: settings.endpoint, forcePathStyle: true } : {}),
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 3,
    requestHandler: { connectionTimeout: 5_000, requestTimeout: 120_000 },
  });
  const location = `s3://${settings.bucket}/${settings.prefix}${settings.endpoint ? ` at ${settings.endpoint}` : ` in ${settings.region}`}`;
  const keyOf = (key: string) => `${settings.prefix}${key}`;
  const get = async (key: string) => {
    try {
      return (await client.send(new GetObjectCommand({ Bucket: settings.bucket, Key: keyOf(key) }))).Body;
    } catch (error) {
      if (error instanceof NoSuchKey) return undefined;
      throw new Error(`reading ${keyOf(key)} from ${location} failed: ${reasonOf(error)}`, { cause: error });
    }
  };
  return {
    kind: 's3',
    location,
    async check() {
      try {
        await client.send(new HeadBucketCommand({ Bucket: settings.bucket }));
      } catch (error) {
        throw new Error(
          `the upload store ${location} cannot be used: ${reasonOf(error)}. ` +
            'Check COGBOOK_S3_BUCKET, COGBOOK_S3_ENDPOINT, COGBOOK_S3_REGION and the AWS_ACCESS_KEY_ID / AWS_SECRET_ACCESS_KEY credentials, ' +
            'or unset COGBOOK_S3_BUCKET to keep uploads in the database.',
          { cause: error },
        );
      }
    },
    async put(key, bytes) {
      try {
        await client.send(new PutObjectCommand({ Bucket: settings.bucket, Key: keyOf(key), Body: bytes, ContentType: 'application/octet-stream' }));
      } catch (error) {
        throw new Error(`storing ${keyOf(key)} in ${location} failed: ${reasonOf(error)}`, { cause: error });
      }
    },
    async read(key) {
      const body = await get(key);
      return body ? await body.transformToByteArray() : undefined;
    },
    async open(key) {
      // In Node the SDK's body is a Readable (an http.IncomingMessage with helpers mixed in).
      return (await get(key)) as Readable | undefined;
    },
    async stat(key) {
      try {
        const head = await client.send(new HeadObjectCommand({ Bucket: settings.bucket, Key: keyOf(key) }));
        return { size: head.ContentLength ?? 0 };
      } catch (error) {
        // HEAD answers carry no body, so a missing key is a bare 404 (NotFound), not NoSuchKey.
        if (error instanceof NotFound || error instanceof NoSuchKey || (error instanceof S3ServiceException && error.$metadata.httpStatusCode === 404)) return undefined;
        throw new Error(`looking up ${keyOf(key)} in ${location} failed: ${reasonOf(error)}`, { cause: error });
      }
    },
    async remove(key) {
      try {
        await client.send(new DeleteObjectCommand({ Bucket: settings.bucket, Key: keyOf(key) }));
      } catch (error) {
        throw new Error(`removing ${keyOf(key)} from ${location} failed: ${reasonOf(error)}`, { cause: error });
      }
    },
  };
}

/** A short reason: S3's answer when there is one, else the network error. */
function reasonOf(error: unknown): string {
  if (error instanceof S3ServiceException) {
    const status = error.$metadata.httpStatusCode;
    if (status === 404) return 'the bucket does not exist (404)';
    if (status === 403) return 'access denied (403): the credentials are missing or not allowed on this bucket';
    if (status === 301 || status === 400) return `the server refused the request (${status} ${error.name}): check the region and endpoint`;
    return `${error.name}${status ? ` (${status})` : ''}: ${error.message}`;
  }
  const e = error as { code?: string; message?: string; name?: string };
  return [e.code ?? e.name, e.message].filter(Boolean).join(': ') || String(error);
}
