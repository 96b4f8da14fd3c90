import { ConflictError, NotFoundError } from '../errors';
import type { Processing } from '../processing/processing';
import { clipKeys } from '../storage/media-keys';
import type { ClipRow } from './clips-repository';

/** What of a clip's media a route serves. */
export type ClipMediaWhat = 'frame' | 'thumb' | 'poster' | 'manifest' | 'original';

/** A stored object to send, with its type. */
export interface ClipMedia {
  key: string;
  type: string;
  row: ClipRow;
}

const VIDEO_TYPES: Record<string, string> = {
  mp4: 'video/mp4',
  mov: 'video/quicktime',
  webm: 'video/webm',
  mkv: 'video/x-matroska',
  avi: 'video/x-msvideo',
  '3gp': 'video/3gpp',
};

/** 409 for a frame that is part of the clip but not extracted yet. */
function notYet(n: number, ready: number, total: number): ConflictError {
  return new ConflictError(
    `Frame ${n} is not extracted yet (${ready} of ${total} frames are ready); it follows shortly.`,
    'frame_not_ready',
  );
}

/**
 * Which stored object answers a media request of a clip the user may see. Frames and thumbnails
 * of a clip still being extracted are served as soon as they exist (frames are written in order;
 * the clip's processed item says how many are complete); one not extracted yet answers 409
 * `frame_not_ready`, one past the end 404.
 */
export async function clipMediaKey(processing: Processing, row: ClipRow, what: ClipMediaWhat, n = 0): Promise<ClipMedia> {
  const keys = clipKeys(row.id);
  if (what === 'original')
    return { key: keys.original(row.stored_name), type: VIDEO_TYPES[row.container] ?? 'application/octet-stream', row };
  if (row.status === 'failed') throw new NotFoundError(what === 'manifest' ? 'Manifest' : 'Frame');
  if (what === 'manifest') return { key: keys.manifest, type: 'application/json', row };
  const total = row.frame_count ?? 0;
  const ready = row.status === 'ready' ? total : await framesReady(processing, row.id);
  if (what === 'frame') {
    if (n >= total) throw new NotFoundError('Frame');
    if (n >= ready) throw notYet(n, ready, total);
    return { key: keys.frame(n), type: 'image/jpeg', row };
  }
  const every = row.thumb_every ?? 1;
  if (what === 'poster') {
    if (row.status !== 'ready') throw notYet(Math.floor(total / 2), ready, total);
    const middle = Math.floor(row.thumb_count / 2);
    if (middle >= row.thumb_count) throw new NotFoundError('Thumbnail');
    return { key: keys.thumb(middle), type: 'image/jpeg', row };
  }
  if (n >= row.thumb_count) throw new NotFoundError('Thumbnail');
  // Thumbnail n shows frame n × every; it is written beside that frame.
  if (row.status !== 'ready' && n * every + 1 >= ready) throw notYet(n * every, ready, total);
  return { key: keys.thumb(n), type: 'image/jpeg', row };
}

/** Frames of a clip being extracted that are complete (0 … done − 1), from its processed item. */
async function framesReady(processing: Processing, clipId: number): Promise<number> {
  const item = await processing.latest('clip', clipId);
  return item?.state === 'running' ? (item.progress?.done ?? 0) : 0;
}
