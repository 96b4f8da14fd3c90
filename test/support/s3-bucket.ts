/**
 * An S3-compatible bucket for tests: s3rver (the local fake of the S3 API from npm; a test-only
 * package) in its own process on a free port, a bucket in it, the store the app uses over it, and the `S3_*`
 * variables that point server and worker processes at it. Also: which keys of the bucket the
 * database rows (and the manifests they lead to) name, to find objects nobody owns.
 */
import fs from 'node:fs';
import { spawn } from 'node:child_process';
import { CreateBucketCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import type { Db } from '../../server/db/knex';
import type { ClipManifest } from '../../server/media/manifest';
import { clipKeys } from '../../server/storage/media-keys';
import { s3MediaStore, type S3StoreOptions } from '../../server/storage/s3-media-store';
import { readJson } from '../../server/storage/stored-objects';

const BUCKET = 'media';

/** The store over a fake bucket (with its SDK client). */
export type S3Store = ReturnType<typeof s3MediaStore>;

/** A running fake bucket. */
export interface TestBucket {
  store: S3Store;
  /** `S3_BUCKET`, `S3_ENDPOINT` and the fake's keys, for a server or worker process. */
  env: Record<string, string>;
  /** Every key in the bucket, sorted (whatever its first part). */
  allKeys(): Promise<string[]>;
  close(): Promise<void>;
}

/** A running s3rver process. */
export interface S3rverProcess {
  /** `http://127.0.0.1:port`. */
  endpoint: string;
  stop(): Promise<void>;
}

/** The fake's fixed keys (it accepts these). */
const FAKE_KEY = 'S3RVER';

/**
 * Starts s3rver in a process of its own with its files under `directory`.
 * `--openssl-legacy-provider`: s3rver (which declares Node ≥ 24) makes the continuation token of a
 * listing longer than 1000 keys with DES, which Node 20's OpenSSL 3 offers only through its legacy
 * provider. `allowMismatchedSignatures`: the fake computes request signatures differently from the
 * current SDK, which real stores accept.
 */
export async function startS3rver(directory: string): Promise<S3rverProcess> {
  const options = JSON.stringify({ port: 0, address: '127.0.0.1', silent: true, directory, allowMismatchedSignatures: true });
  const code = `const S3rver = require('@20minutes/s3rver'); new S3rver(${options}).run().then(({ port }) => console.log('s3rver port ' + port));`;
  const child = spawn(process.execPath, ['--openssl-legacy-provider', '-e', code], { stdio: ['ignore', 'pipe', 'inherit'] });
  const port = await new Promise<number>((resolve, reject) => {
    let out = '';
    child.stdout.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /s3rver port (\d+)/.exec(out);
      if (m) resolve(Number(m[1]));
    });
    child.once('exit', (c) => reject(new Error(`s3rver exited with ${c}`)));
  });
  return {
    endpoint: `http://127.0.0.1:${port}`,
    async stop() {
      if (child.exitCode !== null) return;
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await exited;
    },
  };
}

/** The store options of bucket `bucket` on the fake at `endpoint`. */
export function fakeBucketOptions(endpoint: string, bucket: string, tempDir?: string): S3StoreOptions {
  return {
    bucket,
    endpoint,
    region: 'us-east-1',
    accessKeyId: FAKE_KEY,
    secretAccessKey: FAKE_KEY,
    forcePathStyle: true,
    ...(tempDir ? { tempDir } : {}),
  };
}

/** Every key in the store's bucket, sorted. */
export async function bucketKeys(store: S3Store, bucket: string): Promise<string[]> {
  const keys: string[] = [];
  let ContinuationToken: string | undefined;
  do {
    const page = await store.client.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken }));
    for (const c of page.Contents ?? []) if (c.Key) keys.push(c.Key);
    ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (ContinuationToken);
  return keys.sort();
}

/** Starts s3rver in a process of its own (see {@link startS3rver}) with its files under `directory` and makes the bucket. */
export async function startBucket(directory: string, tempDir?: string): Promise<TestBucket> {
  const fake = await startS3rver(directory);
  if (tempDir) fs.mkdirSync(tempDir, { recursive: true });
  const store = s3MediaStore(fakeBucketOptions(fake.endpoint, BUCKET, tempDir));
  await store.client.send(new CreateBucketCommand({ Bucket: BUCKET }));
  return {
    store,
    env: {
      S3_BUCKET: BUCKET,
      S3_ENDPOINT: fake.endpoint,
      S3_ACCESS_KEY_ID: FAKE_KEY,
      S3_SECRET_ACCESS_KEY: FAKE_KEY,
      S3_FORCE_PATH_STYLE: 'true',
    },
    allKeys: () => bucketKeys(store, BUCKET),
    async close() {
      store.client.destroy();
      await fake.stop();
    },
  };
}

/**
 * The keys that the rows of `clipIds` name, with what their manifests name: each clip's original
 * (`clips.stored_name`) and manifest, the frames and thumbnails its manifest counts, and both
 * images of each ready still of the clip at its render version (`stills.render_version`).
 */
export async function keysNamedByRows(db: Db, store: TestBucket['store'], clipIds: number[]): Promise<string[]> {
  const named: string[] = [];
  for (const clip of await db('clips').whereIn('id', clipIds).select<{ id: number; stored_name: string }[]>('id', 'stored_name')) {
    const keys = clipKeys(clip.id);
    named.push(keys.original(clip.stored_name));
    const manifest = await readJson<ClipManifest>(store, keys.manifest);
    if (!manifest) continue;
    named.push(keys.manifest);
    for (let i = 0; i < manifest.frameCount; i++) named.push(keys.frame(i));
    for (let i = 0; i < manifest.thumbCount; i++) named.push(keys.thumb(i));
  }
  const stills = await db('stills')
    .whereIn('clip_id', clipIds)
    .where({ status: 'ready' })
    .select<{ id: number; clip_id: number; render_version: number }[]>('id', 'clip_id', 'render_version');
  for (const still of stills) {
    named.push(clipKeys(still.clip_id).still(still.id, still.render_version, 'png'));
    named.push(clipKeys(still.clip_id).still(still.id, still.render_version, 'jpeg'));
  }
  return named.sort();
}
