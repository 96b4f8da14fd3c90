/** What the demonstration tests (pictures and clips of an exercise) share: multipart uploads and the files stored for exercises. */
import fs from 'node:fs';
import path from 'node:path';
import type { Client } from './test-app';

/** POSTs `file` (a path, or bytes named `name`) as the multipart field `file`, with an optional caption. */
export async function uploadFile(client: Client, url: string, file: string | Buffer, name?: string, caption?: string) {
  const req = client.agent
    .post(url)
    .set('X-XSRF-TOKEN', await client.xsrf())
    .attach('file', file, name);
  return caption === undefined ? req : req.field('caption', caption);
}

/** Every stored file under `uploads/exercises` (none may stay behind a refusal). */
export function storedExerciseFiles(uploadsDir: string): string[] {
  const root = path.join(uploadsDir, 'exercises');
  if (!fs.existsSync(root)) return [];
  return (fs.readdirSync(root, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(root, f)).isFile());
}
