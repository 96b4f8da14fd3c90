/**
 * The MediaStore contract, run against both implementations: local folders and an S3-compatible
 * bucket through the AWS SDK v3, the bucket served by s3rver (a local fake of the S3 API from npm;
 * `allowMismatchedSignatures`: the fake computes request signatures differently from the current
 * SDK, which real stores accept). What a store must do is read back through the same calls and,
 * for ffmpeg's local paths, through the file system.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import S3rver from '@20minutes/s3rver';
import { CreateBucketCommand } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localMediaStore } from '../../../server/storage/local-media-store';
import { MissingMediaError, type MediaStore } from '../../../server/storage/media-store';
import { s3MediaStore } from '../../../server/storage/s3-media-store';
import { readSmall } from '../../../server/storage/stored-objects';

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'store-contract-'));
let s3rver: S3rver;
const stores: Record<string, MediaStore> = {};

beforeAll(async () => {
  stores['local folders'] = localMediaStore(path.join(root, 'local'));
  s3rver = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: path.join(root, 's3'), allowMismatchedSignatures: true });
  const { port } = await s3rver.run();
  const s3 = s3MediaStore({
    bucket: 'media',
    endpoint: `http://127.0.0.1:${port}`,
    region: 'us-east-1',
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    forcePathStyle: true,
    tempDir: path.join(root, 'tmp'),
  });
  fs.mkdirSync(path.join(root, 'tmp'));
  await s3.client.send(new CreateBucketCommand({ Bucket: 'media' }));
  stores['S3-compatible bucket'] = s3;
}, 60_000);
afterAll(async () => {
  await s3rver?.close();
  fs.rmSync(root, { recursive: true, force: true });
});

const text = async (s: Readable) => (await readSmall({ get: async () => s } as unknown as MediaStore, 'x')).toString();

describe.each(['local folders', 'S3-compatible bucket'])('MediaStore contract: %s', (name) => {
  const store = () => stores[name]!;

  it('puts bytes, strings and streams, and reads them back whole and by byte range', async () => {
    await store().put('clips/1/manifest.json', '{"a":1}');
    await store().put('clips/1/frames/000001.jpg', Buffer.from('frame-one'));
    await store().put('clips/1/original.mp4', Readable.from([Buffer.from('0123'), Buffer.from('456789')]));
    expect(await text(await store().get('clips/1/manifest.json'))).toBe('{"a":1}');
    expect(await text(await store().get('clips/1/original.mp4'))).toBe('0123456789');
    expect(await text(await store().get('clips/1/original.mp4', { start: 2, end: 5 }))).toBe('2345');
    expect((await store().stat('clips/1/original.mp4'))?.size).toBe(10);
  });

  it("stores a stream of another stream library (archiver's zip, as a data export writes it) whole", async () => {
    const { default: archiver } = await import('archiver');
    const zip = archiver('zip', { store: true });
    const written = store().put('exports/1/export-1.zip', zip as unknown as Readable);
    zip.append('hello', { name: 'a.txt' });
    await zip.finalize();
    await written;
    const bytes = await readSmall(store(), 'exports/1/export-1.zip');
    // Outside reference: the ZIP format's end-of-central-directory record (PKWARE APPNOTE 4.3.16), "PK\x05\x06", 22 bytes from the end without a comment.
    expect(bytes.subarray(bytes.length - 22, bytes.length - 18)).toEqual(Buffer.from('PK\x05\x06', 'latin1'));
    expect(bytes.length).toBe(zip.pointer());
  });

  it('lists keys under a prefix, sorted; removes one and a prefix', async () => {
    await store().put('clips/2/frames/000002.jpg', 'b');
    await store().put('clips/2/frames/000001.jpg', 'a');
    await store().put('clips/20/frames/000001.jpg', 'other clip');
    expect(await store().list('clips/2/')).toEqual(['clips/2/frames/000001.jpg', 'clips/2/frames/000002.jpg']);
    await store().remove('clips/2/frames/000001.jpg');
    await store().remove('clips/2/frames/000009.jpg'); // nothing there: no error
    expect(await store().list('clips/2/')).toEqual(['clips/2/frames/000002.jpg']);
    await store().removePrefix('clips/2/');
    expect(await store().list('clips/2/')).toEqual([]);
    expect(await store().list('clips/20/')).toEqual(['clips/20/frames/000001.jpg']);
  });

  it('a missing key: get throws MissingMediaError (404), stat is null, withLocalFile throws', async () => {
    await expect(store().get('clips/3/manifest.json')).rejects.toBeInstanceOf(MissingMediaError);
    expect(await store().stat('clips/3/manifest.json')).toBeNull();
    await expect(store().withLocalFile('clips/3/original.mp4', async () => 1)).rejects.toBeInstanceOf(MissingMediaError);
  });

  it('moves a local file in (the file is gone), and lends a local path of an object to read', async () => {
    const local = path.join(root, `upload-${name.length}.bin`);
    fs.writeFileSync(local, 'uploaded bytes');
    await store().putFile('clips/4/original.mov', local);
    expect(fs.existsSync(local)).toBe(false);
    const seen = await store().withLocalFile('clips/4/original.mov', async (p) => fs.readFileSync(p, 'utf8'));
    expect(seen).toBe('uploaded bytes');
  });

  it('a local folder: what is published becomes objects under the prefix; the rest is not', async () => {
    await store().withLocalFolder('clips/5/', async (folder) => {
      fs.mkdirSync(path.join(folder.path, 'frames'), { recursive: true });
      fs.writeFileSync(path.join(folder.path, 'frames', '000001.jpg'), 'f1');
      fs.writeFileSync(path.join(folder.path, 'video-v1.mp4'), 'mp4');
      await folder.publish(['frames/000001.jpg', 'video-v1.mp4']);
    });
    expect(await store().list('clips/5/')).toEqual(['clips/5/frames/000001.jpg', 'clips/5/video-v1.mp4']);
    expect(await text(await store().get('clips/5/video-v1.mp4'))).toBe('mp4');
  });

  it('refuses keys that could leave their place', async () => {
    await expect(store().put('../escape', 'x')).rejects.toThrow(/bad media key/);
    await expect(store().list('clips/6')).rejects.toThrow(/bad media prefix/);
  });
});
