import type { Readable } from 'node:stream';
import { NotFoundError } from '../errors';

/** Size and time of one stored object. */
export interface StoredObject {
  key: string;
  size: number;
  modifiedAt: Date;
}

/**
 * A folder on this machine that ffmpeg writes into; the files in it are read back by key
 * (`prefix + relative name`) once published. For the local store the folder IS the stored
 * place, so publishing costs nothing; an object store uploads what is published.
 */
export interface LocalFolder {
  /** Absolute path of the folder (created). */
  readonly path: string;
  /** Makes these files (names relative to {@link path}, `/`-separated) readable by key, in order. */
  publish(names: readonly string[]): Promise<void>;
}

/**
 * Where media lives, by key and stream. Keys name things (`clips/12/frames/000001.jpg`,
 * `clips/12/manifest.json`, `assessments/3/summaries/summary-7.pdf`; see `media-keys.ts`) and never
 * come from user input. The local-folder implementation (`local-media-store.ts`) keeps them under
 * `uploads/`; an S3-compatible store implements the same calls (streams, never whole big files in
 * memory). Services use only this; a local path exists only for ffmpeg, through
 * {@link withLocalFile} and {@link withLocalFolder}.
 */
export interface MediaStore {
  /** Stores bytes or a stream under `key`, replacing what was there; readers see the old or the new object, never half. */
  put(key: string, body: Readable | Buffer | string): Promise<void>;
  /** Moves a local file (an accepted upload's temp file) in as `key`; the local file is gone afterwards. */
  putFile(key: string, localFile: string): Promise<void>;
  /** A stream of the object. @throws {MissingMediaError} when there is none. */
  get(key: string): Promise<Readable>;
  /** The object's size and time, or null when there is none. */
  stat(key: string): Promise<StoredObject | null>;
  /** Keys under `prefix` (which ends with `/`), sorted. */
  list(prefix: string): Promise<string[]>;
  /** Removes one object (nothing when it is not there). */
  remove(key: string): Promise<void>;
  /** Removes every object under `prefix` (which ends with `/`). */
  removePrefix(prefix: string): Promise<void>;
  /**
   * Runs `fn` with a local path of the object (ffmpeg and ffprobe read files): the stored file
   * itself for the local store, a temporary download for an object store.
   * @throws {MissingMediaError} when there is no such object.
   */
  withLocalFile<T>(key: string, fn: (path: string) => Promise<T>): Promise<T>;
  /** Runs `fn` with a local folder whose files become objects under `prefix` as they are published. */
  withLocalFolder<T>(prefix: string, fn: (folder: LocalFolder) => Promise<T>): Promise<T>;
}

/** A key with no stored object (a 404 wherever it reaches a route). */
export class MissingMediaError extends NotFoundError {
  constructor(readonly key: string) {
    super('File');
  }
}
