/**
 * Object storage for attachments: any S3-compatible bucket through the AWS SDK, addressed by
 * content (the key is derived from the file's SHA-256), so a file is stored once however often
 * it is attached, and a stored object can always be re-hashed against its key.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import type { Readable } from 'node:stream';
import type { S3Client } from '@aws-sdk/client-s3';
import type { Config } from '../config';

/** A stored object read back: its bytes as a stream, and what a Range request got. */
export interface StoredObject {
  body: Readable;
  /** Bytes in `body`. */
  contentLength: number;
  /** Size of the whole object. */
  totalSize: number;
  /** For a Range request: the `bytes a-b/n` the store answered; null for the whole object. */
  contentRange: string | null;
}

/** What the rest of the server needs from object storage. */
export interface ObjectStore {
  bucket: string;
  /** Uploads a file from disk under a key (skipped by the caller when the key exists). */
  putFile: (key: string, filePath: string, size: number, contentType: string) => Promise<void>;
  /** The size of the object under a key, or null when there is none. */
  sizeOf: (key: string) => Promise<number | null>;
  /** Streams an object (or the byte range `range`, an HTTP Range header value); null when there is none. */
  get: (key: string, range?: string) => Promise<StoredObject | null>;
  /** Re-reads an object and hashes it: its SHA-256 and size, or null when there is none. */
  rehash: (key: string) => Promise<{ sha256: string; size: number } | null>;
  close: () => void;
}

/** The bucket key of a file with this SHA-256: a two-level fan-out keeps listings short. */
export function objectKeyOf(sha256: string): string {
  return `sha256/${sha256.slice(0, 2)}/${sha256.slice(2, 4)}/${sha256}`;
}

// The AWS SDK is large; a server that never touches an attachment does not load it.
type Sdk = typeof import('@aws-sdk/client-s3');
let sdkLoading: Promise<Sdk> | null = null;
const loadSdk = (): Promise<Sdk> => (sdkLoading ??= import('@aws-sdk/client-s3'));

function isMissing(sdk: Sdk, error: unknown): boolean {
  if (error instanceof sdk.S3ServiceException) {
    return error.$metadata.httpStatusCode === 404 || error.name === 'NotFound' || error.name === 'NoSuchKey' || error.name === 'NoSuchBucket';
  }
  return false;
}

/**
 * The object store the configuration names: S3_ENDPOINT (a stand-in or another S3-compatible
 * service, path-style) and/or S3_BUCKET with the keys and region. Null when neither is set:
 * attachments then answer 503 and the rest of the app works on.
 */
export function createObjectStore(config: Config): ObjectStore | null {
  if (!config.S3_ENDPOINT && !config.S3_BUCKET) return null;
  const bucket = config.S3_BUCKET ?? 'halfmark-attachments';
  const makeClient = (sdk: Sdk): S3Client =>
    new sdk.S3Client({
      region: config.S3_REGION,
      ...(config.S3_ENDPOINT ? { endpoint: config.S3_ENDPOINT } : {}),
      forcePathStyle: config.S3_FORCE_PATH_STYLE,
      ...(config.S3_ACCESS_KEY_ID && config.S3_SECRET_ACCESS_KEY
        ? { credentials: { accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY } }
        : {}),
      // Checksums only where S3 demands them: stand-ins and older S3-compatible stores do not
      // understand the streamed trailing checksums newer SDKs send by default. Our own SHA-256
      // is the integrity check that matters, and the verifier re-hashes every object.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  let ready: Promise<{ sdk: Sdk; client: S3Client }> | null = null;
  const connect = () => (ready ??= loadSdk().then((sdk) => ({ sdk, client: makeClient(sdk) })));
  let bucketReady: Promise<void> | null = null;
  const ensureBucket = async (): Promise<{ sdk: Sdk; client: S3Client }> => {
    const s3 = await connect();
    const { sdk, client } = s3;
    bucketReady ??= (async () => {
      try {
        await client.send(new sdk.HeadBucketCommand({ Bucket: bucket }));
      } catch (error) {
        if (!isMissing(sdk, error)) throw error;
        await client.send(new sdk.CreateBucketCommand({ Bucket: bucket }));
      }
    })().catch((error: unknown) => {
      // Try again on the next call rather than remember a passing outage.
      bucketReady = null;
      throw error;
    });
    await bucketReady;
    return s3;
  };

  const get = async (key: string, range?: string): Promise<StoredObject | null> => {
    const { sdk, client } = await ensureBucket();
    try {
      const out = await client.send(new sdk.GetObjectCommand({ Bucket: bucket, Key: key, ...(range ? { Range: range } : {}) }));
      const contentRange = out.ContentRange ?? null;
      const total = contentRange ? Number(/\/(\d+)$/.exec(contentRange)?.[1] ?? out.ContentLength ?? 0) : Number(out.ContentLength ?? 0);
      return { body: out.Body as Readable, contentLength: Number(out.ContentLength ?? 0), totalSize: total, contentRange };
    } catch (error) {
      if (isMissing(sdk, error)) return null;
      throw error;
    }
  };

  return {
    bucket,
    putFile: async (key, filePath, size, contentType) => {
      const { sdk, client } = await ensureBucket();
      await client.send(
        new sdk.PutObjectCommand({ Bucket: bucket, Key: key, Body: createReadStream(filePath), ContentLength: size, ContentType: contentType }),
      );
    },
    sizeOf: async (key) => {
      const { sdk, client } = await ensureBucket();
      try {
        const head = await client.send(new sdk.HeadObjectCommand({ Bucket: bucket, Key: key }));
        return Number(head.ContentLength ?? 0);
      } catch (error) {
        if (isMissing(sdk, error)) return null;
        throw error;
      }
    },
    get,
    rehash: async (key) => {
      const object = await get(key);
      if (object === null) return null;
      const hash = createHash('sha256');
      let size = 0;
      for await (const chunk of object.body) {
        const bytes = chunk as Buffer;
        size += bytes.length;
        hash.update(bytes);
      }
      return { sha256: hash.digest('hex'), size };
    },
    close: () => {
      void ready?.then(({ client }) => client.destroy());
    },
  };
}
