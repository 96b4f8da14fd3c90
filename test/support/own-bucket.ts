/**
 * A bucket of one test app's own on the suite's object-storage fake (`TEST_S3_ENDPOINT`, started by
 * `scripts/test-postgres.ts`): a unique name, so test files running at once never share keys, a
 * temp folder of its own for ffmpeg's copies, and removal of its objects when the app closes.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CreateBucketCommand, DeleteBucketCommand, DeleteObjectsCommand } from '@aws-sdk/client-s3';
import { s3MediaStore, type S3StoreOptions } from '../../server/storage/s3-media-store';
import { bucketKeys, fakeBucketOptions, type S3Store } from './s3-bucket';

/** A test app's bucket. */
export interface OwnBucket {
  options: S3StoreOptions;
  store: S3Store;
  /** Every key in it, sorted. */
  keys(): Promise<string[]>;
  /** Removes its objects, the bucket and the temp folder. */
  remove(): Promise<void>;
}

/** Makes a new bucket on the fake at `endpoint`. */
export async function openOwnBucket(endpoint: string): Promise<OwnBucket> {
  const name = `tf-${process.pid}-${crypto.randomBytes(5).toString('hex')}`;
  const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), 'trailframe-s3-test-'));
  const options = fakeBucketOptions(endpoint, name, tempDir);
  const store = s3MediaStore(options);
  await store.client.send(new CreateBucketCommand({ Bucket: name }));
  return {
    options,
    store,
    keys: () => bucketKeys(store, name),
    async remove() {
      try {
        const keys = await bucketKeys(store, name);
        for (let i = 0; i < keys.length; i += 1000) {
          const Objects = keys.slice(i, i + 1000).map((Key) => ({ Key }));
          await store.client.send(new DeleteObjectsCommand({ Bucket: name, Delete: { Objects } }));
        }
        await store.client.send(new DeleteBucketCommand({ Bucket: name }));
      } finally {
        store.client.destroy();
        fs.rmSync(tempDir, { recursive: true, force: true });
      }
    },
  };
}
