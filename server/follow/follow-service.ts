/**
 * Starting marker following on a clip: checks the clip, the range and the start frame's landmarks,
 * then queues a {@link FOLLOW_MARKERS} item whose progress goes out on the athlete's stream.
 */
import type { FollowMarkersRequest, FollowMarkersStarted } from '../../src/contracts/annotations';
import type { SessionUser } from '../../src/contracts/api';
import type { AnnotationsService } from '../annotations/annotations-service';
import type { ClipsService } from '../clips/clips-service';
import type { Db } from '../db/knex';
import { AppError, ConflictError, ValidationError } from '../errors';
import type { Processing } from '../processing/processing';
import type { MediaStore } from '../storage/media-store';
import { FOLLOW_MARKERS, followMarkersKind, type FollowPayload } from './follow-kind';
import { planFollow } from './follow-plan';
import { isOnTapeDot } from './marker-follower';
import { storedFrameReader } from './stored-frames';

export function followService(d: {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  annotations: AnnotationsService;
}) {
  const { db, processing } = d;
  processing.register(followMarkersKind(d));
  return {
    /**
     * Queues following the markers of `startFrame` over `from`–`to`. 409 `clip_not_ready` while
     * frames are extracted, 409 `follow_running` when the clip is being followed already, 422 when
     * the range leaves the clip, the start frame has no landmarks, or none of them is on a tape
     * marker (`no_markers_found`: a clip filmed without markers).
     */
    async start(user: SessionUser, clipId: number, body: FollowMarkersRequest): Promise<FollowMarkersStarted> {
      const clip = await d.clips.accessibleClip(user, clipId, 'landmark:follow');
      if (clip.status !== 'ready' || !clip.frame_count)
        throw new ConflictError('This clip is not ready yet: wait until its frames are extracted.', 'clip_not_ready');
      if (body.to >= clip.frame_count)
        throw new ValidationError(`Frame ${body.to} is beyond the clip's last frame (${clip.frame_count - 1}).`, [
          { path: ['to'], message: `The clip's last frame is ${clip.frame_count - 1}.` },
        ]);
      const marks = await d.annotations.read(clipId);
      if (!marks.landmarks.some((l) => l.frame === body.startFrame && Object.keys(l.points).length))
        throw new AppError(
          422,
          'no_start_landmarks',
          `Frame ${body.startFrame} has no landmarks: place the markers on the frame to start from, then follow. Nothing was changed.`,
        );
      const size = { width: clip.width ?? 0, height: clip.height ?? 0 };
      const { markers } = planFollow(marks.landmarks, body, size);
      const startImage = await storedFrameReader(d.store, clipId, { frameCount: clip.frame_count, ...size }, 1).read(body.startFrame);
      if (!markers.some((m) => isOnTapeDot(startImage, m.start)))
        throw new AppError(
          422,
          'no_markers_found',
          `None of the points on frame ${body.startFrame} sits on a high-contrast tape marker, so following could only guess: ` +
            'put tape dots on the hip, knee, ankle, heel and toe and film again, or place the landmarks by hand. Nothing was changed.',
        );
      const busy = await db('processed_items')
        .where({ kind: FOLLOW_MARKERS, subject_type: 'clip', subject_id: clipId })
        .whereIn('state', ['queued', 'running'])
        .first('id');
      if (busy) throw new ConflictError('Markers on this clip are being followed already: wait until that run ends.', 'follow_running');
      const payload: FollowPayload = { ...body, userId: user.id };
      const itemId = await db.transaction((trx) =>
        processing.enqueue(trx, FOLLOW_MARKERS, clipId, { clinicId: clip.clinic_id, athleteId: clip.athlete_id }, { ...payload }),
      );
      return { itemId, kind: FOLLOW_MARKERS };
    },

    /**
     * Stops the clip's queued or running follow. Nothing it followed is kept: the followed points
     * are saved only when a run ends, so the clip's landmarks stay as they were before it started.
     * 409 `follow_not_running` when no follow is queued or running.
     */
    async cancel(user: SessionUser, clipId: number): Promise<{ cancelled: number }> {
      await d.clips.accessibleClip(user, clipId, 'landmark:follow');
      const cancelled = await processing.cancel('clip', clipId, FOLLOW_MARKERS);
      if (!cancelled)
        throw new ConflictError('No markers are being followed on this clip: there is nothing to cancel.', 'follow_not_running');
      return { cancelled };
    },
  };
}
export type FollowService = ReturnType<typeof followService>;
