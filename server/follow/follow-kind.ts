/**
 * Marker following as a processed item about a clip: the markers of the start frame are followed
 * through the clip's stored working frames, and the followed points are saved into the clip's
 * landmarks (placed and accepted points stay as they are) as the person who asked.
 */
import type { Db } from '../db/knex';
import type { AnnotationsService } from '../annotations/annotations-service';
import { PermanentError, type ProcessingKind } from '../processing/processed-item';
import type { ClipManifest } from '../media/manifest';
import { clipKeys } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { readJson } from '../storage/stored-objects';
import { mergeFollowed, notFollowedAfterFollow, planFollow } from './follow-plan';
import { followMarkers, type FollowResult, type LostPoint } from './marker-follower';
import { loadOpenCv } from './opencv';
import { storedFrameReader } from './stored-frames';

/** The kind's name on items and on the progress stream. */
export const FOLLOW_MARKERS = 'follow_markers';

/** What a follow item carries: the range and who asked (the save is theirs). */
export interface FollowPayload {
  startFrame: number;
  from: number;
  to: number;
  userId: number;
}

/** What a finished follow reports in its log line. */
interface Followed {
  points: number;
  lowConfidenceFrames: number;
  notOnDot: string[];
  /** Per marker (`side landmark`), the frames it was not found on and why. */
  lost: Record<string, LostPoint[]>;
  repeatedFrames: number[];
}

/**
 * Saves a finished follow run as `actor`: the followed points merge into the clip's landmarks
 * (placed and accepted points stay), the frames it lost replace the run's markers' earlier frames
 * not followed over the range, and the audit line `clip.markers-followed` carries the counts.
 */
export async function saveFollowRun(
  annotations: AnnotationsService,
  actor: { id: number; name: string; clinicId: number },
  clipId: number,
  range: { startFrame: number; from: number; to: number },
  size: { width: number; height: number },
  result: Pick<FollowResult, 'points' | 'lost' | 'lowConfidenceFrames' | 'repeatedFrames'>,
): Promise<{ points: number; lost: Record<string, LostPoint[]> }> {
  let points = 0;
  for (const list of result.points.values()) points += list.length;
  // Every frame of the range is followed, placed, or lost here with the reason: none goes missing unsaid.
  const lost = Object.fromEntries([...result.lost].filter(([, list]) => list.length > 0));
  await annotations.changeLandmarks(
    actor,
    clipId,
    (landmarks) => mergeFollowed(landmarks, result, range, size),
    'clip.markers-followed',
    { ...range, points, lowConfidenceFrames: result.lowConfidenceFrames.length, lost, repeatedFrames: result.repeatedFrames },
    // The frames lost go beside the followed points, for the review to send the coach to them.
    (stored) => notFollowedAfterFollow(stored, result, range),
  );
  return { points, lost };
}

export function followMarkersKind(d: { db: Db; store: MediaStore; annotations: AnnotationsService }): ProcessingKind<Followed | null> {
  const { db, store, annotations } = d;
  return {
    name: FOLLOW_MARKERS,
    subject: 'clip',
    athleteSees: false,

    async run(item, ctx) {
      const clipId = item.subjectId;
      const payload = item.payload as unknown as FollowPayload;
      const range = { startFrame: payload.startFrame, from: payload.from, to: payload.to };
      const clip = await db('clips')
        .where({ id: clipId })
        .first<{ frame_count: number | null; width: number | null; height: number | null }>();
      if (!clip) return null; // deleted meanwhile
      if (!clip.frame_count || !clip.width || !clip.height)
        throw new PermanentError('The clip has no extracted frames to follow markers on.');
      const user = await db('users')
        .where({ id: payload.userId })
        .first<{ id: number; name: string; clinic_id: number }>('id', 'name', 'clinic_id');
      if (!user) throw new PermanentError('The person who asked for following no longer has an account.');
      const size = { width: clip.width, height: clip.height };
      const current = await annotations.read(clipId);
      const plan = planFollow(current.landmarks, range, size);
      if (!plan.markers.length)
        throw new PermanentError(`Frame ${range.startFrame} has no landmarks any more: place them, then follow again.`);
      const cv = await loadOpenCv();
      const reader = storedFrameReader(store, clipId, { frameCount: clip.frame_count, ...size });
      // The frames' real times: a phone's variable frame rate makes intervals uneven.
      const manifest = await readJson<ClipManifest>(store, clipKeys(clipId).manifest);
      const result = await followMarkers(cv, reader, {
        ...range,
        ...plan,
        timesMs: manifest?.timestampsMs,
        onProgress: (done, total) => ctx.progress(done, total),
        signal: ctx.signal,
      });
      ctx.signal.throwIfAborted();
      const { points, lost } = await saveFollowRun(
        annotations,
        { id: user.id, name: user.name, clinicId: user.clinic_id },
        clipId,
        range,
        size,
        result,
      );
      return {
        points,
        lowConfidenceFrames: result.lowConfidenceFrames.length,
        notOnDot: result.notOnDot,
        lost,
        repeatedFrames: result.repeatedFrames,
      };
    },

    async onReady() {
      // The followed points were saved with the clip's landmarks by `run`.
    },
    async onChange() {
      // A clip has no state of its own for following: the item's state is on the stream.
    },
  };
}
