/** Small helpers over any {@link MediaStore}: whole small objects and JSON documents. */
import { MissingMediaError, type MediaStore } from './media-store';

/** Reads a whole small object (a manifest, a frame, a still) into memory; never for originals. */
export async function readSmall(store: MediaStore, key: string, maxBytes = 64 * 1024 * 1024): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of await store.get(key)) {
    size += (chunk as Buffer).length;
    if (size > maxBytes) throw new Error(`${key} is larger than ${maxBytes} bytes`);
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks);
}

/** A stored JSON document, or null when there is none. */
export async function readJson<T>(store: MediaStore, key: string): Promise<T | null> {
  try {
    return JSON.parse((await readSmall(store, key, 16 * 1024 * 1024)).toString('utf8')) as T;
  } catch (err) {
    if (err instanceof MissingMediaError) return null;
    throw err;
  }
}

/** Stores a JSON document (replacing it whole). */
export function putJson(store: MediaStore, key: string, value: unknown): Promise<void> {
  return store.put(key, JSON.stringify(value));
}
