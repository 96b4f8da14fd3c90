/** What the demonstration tests (pictures and clips of an exercise) share: multipart uploads and the files stored for exercises. */
import type { MediaStore } from '../../server/storage/media-store';
import type { Client } from './test-app';

/** POSTs `file` (a path, or bytes named `name`) as the multipart field `file`, with an optional caption. */
export async function uploadFile(client: Client, url: string, file: string | Buffer, name?: string, caption?: string) {
  const req = client.agent
    .post(url)
    .set('X-XSRF-TOKEN', await client.xsrf())
    .attach('file', file, name);
  return caption === undefined ? req : req.field('caption', caption);
}

/** Every stored object under `exercises/` in the app's store, local or bucket (none may stay behind a refusal); names relative to it. */
export async function storedExerciseFiles(store: MediaStore): Promise<string[]> {
  return (await store.list('exercises/')).map((key) => key.slice('exercises/'.length));
}
