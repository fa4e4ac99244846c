import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import S3rver from 's3rver';

/** s3rver accepts requests signed with this pair; the last entry keeps the AWS SDK from warning about Node's version. */
export const S3RVER_CREDENTIALS = { AWS_ACCESS_KEY_ID: 'S3RVER', AWS_SECRET_ACCESS_KEY: 'S3RVER', AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' };

/** One bucket on a local S3-compatible server, and a client that reads it directly (not through the app). */
export interface TestBucket {
  name: string;
  endpoint: string;
  client: S3Client;
  /** Every key in the bucket, sorted. */
  keys(): Promise<string[]>;
  object(key: string): Promise<Uint8Array>;
  /** Deletes every object. */
  empty(): Promise<void>;
  /** Stops the server, removes its folder and puts the credentials' environment variables back as they were. */
  close(): Promise<void>;
}

/**
 * Starts s3rver on a free port with one empty bucket, in a fresh temporary folder, and sets
 * the credentials it accepts in process.env (where the app's S3 client reads them).
 */
export async function startTestBucket(name: string): Promise<TestBucket> {
  const savedEnv: Record<string, string | undefined> = {};
  for (const [k, v] of Object.entries(S3RVER_CREDENTIALS)) {
    savedEnv[k] = process.env[k];
    process.env[k] = v;
  }
  const directory = mkdtempSync(join(tmpdir(), `${name}-s3-`));
  const server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory, configureBuckets: [{ name }] });
  const { port } = await server.run();
  const endpoint = `http://127.0.0.1:${port}`;
  const client = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } });
  const keys = async (): Promise<string[]> => ((await client.send(new ListObjectsV2Command({ Bucket: name }))).Contents ?? []).map((o) => o.Key!).sort();
  return {
    name,
    endpoint,
    client,
    keys,
    object: async (key) => (await client.send(new GetObjectCommand({ Bucket: name, Key: key }))).Body!.transformToByteArray(),
    async empty() {
      for (const key of await keys()) await client.send(new DeleteObjectCommand({ Bucket: name, Key: key }));
    },
    async close() {
      client.destroy();
      await server.close();
      rmSync(directory, { recursive: true, force: true });
      for (const [k, v] of Object.entries(savedEnv)) {
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      }
    },
  };
}
