/**
 * A stand-in S3 server (s3rver) on 127.0.0.1 for `npm start`, `npm run dev` and the tests: it
 * keeps objects as plain files in a folder, so attachments work without any cloud account.
 * Production points S3_ENDPOINT / S3_BUCKET at a real S3-compatible bucket instead.
 */
import { mkdirSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { createRequire } from 'node:module';
import path from 'node:path';

interface S3rverOptions {
  address: string;
  port: number;
  directory: string;
  silent: boolean;
  configureBuckets: { name: string }[];
}

interface S3rverInstance {
  run: () => Promise<AddressInfo>;
  close: () => Promise<void>;
}

type S3rverConstructor = new (options: S3rverOptions) => S3rverInstance;

// s3rver is CommonJS without type declarations; this is the part of its API used here.
const S3rver = createRequire(import.meta.url)('s3rver') as S3rverConstructor;

/** s3rver's fixed development key pair: it checks signatures against these. */
const STAND_IN_KEY = 'S3RVER';

/** A running stand-in and the environment that points Halfmark at it. */
export interface S3StandIn {
  endpoint: string;
  bucket: string;
  directory: string;
  /** S3_* variables for loadConfig. */
  env: Record<string, string>;
  close: () => Promise<void>;
}

/**
 * Starts s3rver on 127.0.0.1 (a free port unless `port` is given) keeping its objects in
 * `directory`, with `bucket` created.
 */
export async function startS3StandIn(opts: { directory: string; bucket?: string; port?: number }): Promise<S3StandIn> {
  const bucket = opts.bucket ?? 'halfmark-attachments';
  mkdirSync(opts.directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port ?? 0,
    directory: opts.directory,
    silent: true,
    configureBuckets: [{ name: bucket }],
  });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  return {
    endpoint,
    bucket,
    directory: opts.directory,
    env: {
      S3_ENDPOINT: endpoint,
      S3_BUCKET: bucket,
      S3_ACCESS_KEY_ID: STAND_IN_KEY,
      S3_SECRET_ACCESS_KEY: STAND_IN_KEY,
      S3_REGION: 'us-east-1',
    },
    close: () => server.close(),
  };
}

/**
 * For `npm start` and `npm run dev`: the stand-in with its objects in `<dataDir>/objects`, unless
 * the environment already names object storage (S3_ENDPOINT or S3_BUCKET), then null.
 */
export async function startObjectStandIn(dataDir: string, env: NodeJS.ProcessEnv = process.env): Promise<S3StandIn | null> {
  if (env.S3_ENDPOINT || env.S3_BUCKET) return null;
  return startS3StandIn({ directory: path.join(dataDir, 'objects') });
}
