import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { PassThrough, Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createRequire } from 'node:module';
import type * as ClientS3 from '@aws-sdk/client-s3';
import type { S3Client, S3ClientConfig } from '@aws-sdk/client-s3';
import type * as LibStorage from '@aws-sdk/lib-storage';
import { MissingMediaError, type MediaStore, type StoredObject } from './media-store';

/** Where the bucket is and how to reach it (`S3_*` in the configuration). */
export interface S3StoreOptions {
  bucket: string;
  /** `https://…` of any S3-compatible object store. */
  endpoint: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** Path-style URLs (`endpoint/bucket/key`), as most self-hosted stores need. */
  forcePathStyle: boolean;
  /** Folder for the temp files ffmpeg reads and writes (default: the system's). */
  tempDir?: string;
}

const KEY_PART = /^[A-Za-z0-9_-][A-Za-z0-9._-]*$/;

/** Prefix of the temp folders ffmpeg works in beside a bucket. */
export const S3_TEMP_PREFIX = 'trailframe-s3-';

/** A temp folder untouched this long belongs to no live job (a job writes into its folder as it runs). */
export const S3_TEMP_STALE_MS = 6 * 3_600_000;

/**
 * Removes the temp folders under `tempRoot` that a process killed mid-job left behind (its
 * `finally` never ran): those whose last change is older than `staleMs`. Other processes' live
 * folders on the same machine are younger and stay. Answers how many were removed.
 */
export async function sweepStaleTempFolders(tempRoot: string, now = Date.now(), staleMs = S3_TEMP_STALE_MS): Promise<number> {
  let removed = 0;
  const entries = await fs.promises.readdir(tempRoot, { withFileTypes: true }).catch(() => []);
  for (const entry of entries) {
    if (!entry.isDirectory() || !entry.name.startsWith(S3_TEMP_PREFIX)) continue;
    const dir = path.join(tempRoot, entry.name);
    const stat = await fs.promises.stat(dir).catch(() => null);
    if (!stat || now - stat.mtimeMs < staleMs) continue;
    await fs.promises.rm(dir, { recursive: true, force: true });
    removed++;
  }
  return removed;
}

/**
 * The body as lib-storage takes it: it accepts only Node's own `Readable` (checked with `instanceof`)
 * and throws at once on a stream of another stream library (archiver's zip is one), which then never
 * drains and its writer waits forever. Such a stream is piped through a Node `PassThrough`.
 */
function nodeReadable(body: Readable | Buffer | string): Readable | Buffer | string {
  if (typeof body === 'string' || Buffer.isBuffer(body) || body instanceof Readable) return body;
  const through = new PassThrough();
  (body as NodeJS.ReadableStream & { on(event: 'error', fn: (err: Error) => void): unknown }).on('error', (err: Error) =>
    through.destroy(err),
  );
  (body as NodeJS.ReadableStream).pipe(through);
  return through;
}

function checkKey(key: string, prefix = false): string {
  const body = prefix ? key.replace(/\/$/, '') : key;
  if ((prefix && !key.endsWith('/')) || !body || !body.split('/').every((p) => KEY_PART.test(p))) {
    throw new Error(`bad media ${prefix ? 'prefix' : 'key'} "${key}"`);
  }
  return key;
}

/**
 * {@link MediaStore} in an S3-compatible bucket through the AWS SDK for JavaScript v3. Bodies are
 * streamed both ways: uploads through `@aws-sdk/lib-storage` (multipart in 8 MiB parts, never the
 * whole file in memory), reads as the SDK's response stream (with byte ranges). ffmpeg's local
 * paths are temp files: {@link MediaStore.withLocalFile} downloads the object and removes the copy
 * afterwards; {@link MediaStore.withLocalFolder} uploads what is published and removes the folder.
 * An object store writes each object whole, so readers never see half of one.
 */
export function s3MediaStore(o: S3StoreOptions, clientConfig: Partial<S3ClientConfig> = {}): MediaStore & { client: S3Client } {
  // The SDK loads only when a bucket is configured: a one-machine server never holds it.
  const load = createRequire(import.meta.url);
  const { DeleteObjectsCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, S3Client, S3ServiceException } = load(
    '@aws-sdk/client-s3',
  ) as typeof ClientS3;
  const { Upload } = load('@aws-sdk/lib-storage') as typeof LibStorage;
  const notFound = (err: unknown) =>
    err instanceof S3ServiceException && (err.$metadata.httpStatusCode === 404 || err.name === 'NoSuchKey' || err.name === 'NotFound');
  const client = new S3Client({
    endpoint: o.endpoint,
    region: o.region,
    forcePathStyle: o.forcePathStyle,
    credentials: { accessKeyId: o.accessKeyId, secretAccessKey: o.secretAccessKey },
    // Checksums only where the API requires them: several S3-compatible stores reject the newer trailers.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    ...clientConfig,
  });
  const Bucket = o.bucket;
  const tempRoot = o.tempDir ?? os.tmpdir();

  async function upload(key: string, body: Readable | Buffer | string): Promise<void> {
    await new Upload({
      client,
      params: { Bucket, Key: checkKey(key), Body: nodeReadable(body) },
      partSize: 8 * 1024 * 1024,
      queueSize: 2,
    }).done();
  }

  async function keysUnder(prefix: string): Promise<string[]> {
    const out: string[] = [];
    let ContinuationToken: string | undefined;
    do {
      const page = await client.send(new ListObjectsV2Command({ Bucket, Prefix: checkKey(prefix, true), ContinuationToken }));
      for (const c of page.Contents ?? []) if (c.Key) out.push(c.Key);
      ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (ContinuationToken);
    return out.sort();
  }

  async function removeKeys(keys: string[]): Promise<void> {
    for (let i = 0; i < keys.length; i += 1000) {
      const Objects = keys.slice(i, i + 1000).map((Key) => ({ Key }));
      if (Objects.length) await client.send(new DeleteObjectsCommand({ Bucket, Delete: { Objects, Quiet: true } }));
    }
  }

  const tempFolder = () => fs.promises.mkdtemp(path.join(tempRoot, S3_TEMP_PREFIX));
  // What a process killed mid-job left in the temp folder goes when the next store starts.
  void sweepStaleTempFolders(tempRoot).catch(() => undefined);

  return {
    client,

    put: upload,

    async putFile(key, localFile) {
      await upload(key, fs.createReadStream(localFile));
      await fs.promises.rm(localFile, { force: true });
    },

    async get(key, range) {
      try {
        const res = await client.send(
          new GetObjectCommand({ Bucket, Key: checkKey(key), Range: range ? `bytes=${range.start}-${range.end}` : undefined }),
        );
        return res.Body as Readable;
      } catch (err) {
        if (notFound(err)) throw new MissingMediaError(key);
        throw err;
      }
    },

    async stat(key): Promise<StoredObject | null> {
      try {
        const head = await client.send(new HeadObjectCommand({ Bucket, Key: checkKey(key) }));
        return { key, size: head.ContentLength ?? 0, modifiedAt: head.LastModified ?? new Date(0) };
      } catch (err) {
        if (notFound(err)) return null;
        throw err;
      }
    },

    list: keysUnder,

    async remove(key) {
      await removeKeys([checkKey(key)]);
    },

    async removePrefix(prefix) {
      await removeKeys(await keysUnder(prefix));
    },

    async withLocalFile(key, fn) {
      const dir = await tempFolder();
      try {
        const file = path.join(dir, path.basename(checkKey(key)));
        await pipeline(await this.get(key), fs.createWriteStream(file));
        return await fn(file);
      } finally {
        await fs.promises.rm(dir, { recursive: true, force: true });
      }
    },

    async withLocalFolder(prefix, fn) {
      checkKey(prefix, true);
      const dir = await tempFolder();
      try {
        return await fn({
          path: dir,
          publish: async (names) => {
            for (const name of names) await upload(`${prefix}${name}`, fs.createReadStream(path.join(dir, ...name.split('/'))));
          },
        });
      } finally {
        await fs.promises.rm(dir, { recursive: true, force: true });
      }
    },
  };
}
