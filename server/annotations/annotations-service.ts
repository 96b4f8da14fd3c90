import type { ClipAnnotations } from '../../src/contracts/annotations';
import type { SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { AppError, ConflictError, ValidationError } from '../errors';
import { audit } from '../audit/audit-log';
import type { ClipsService } from '../clips/clips-service';
import type { ClipRow } from '../clips/clips-repository';
import { annotationsRepository as repo } from './annotations-repository';
import type { AnnotationsInput } from './annotations-schemas';

export interface AnnotationsDeps {
  db: Db;
  clips: ClipsService;
  /** Checks event order; returns problems in words (from src/kinematics). */
  validateEvents: (events: AnnotationsInput['events'], frameCount: number) => string[];
  /** Recomputes the clip's measures snapshot inside the save's transaction. */
  afterSave: (trx: Db, clip: ClipRow, annotations: ClipAnnotations) => Promise<void>;
}

/** A clip's landmarks, events, scale and angle gauges, saved whole with optimistic concurrency. */
export function annotationsService(d: AnnotationsDeps) {
  const { db } = d;
  return {
    async get(user: SessionUser, clipId: number): Promise<ClipAnnotations> {
      await d.clips.accessibleClip(user, clipId, 'annotation:read');
      return repo.read(db, clipId);
    },

    async put(user: SessionUser, clipId: number, input: AnnotationsInput): Promise<ClipAnnotations> {
      const clip = await d.clips.accessibleClip(user, clipId, 'annotation:write');
      if (clip.status !== 'ready' || !clip.frame_count) {
        throw new ConflictError('This clip is not ready yet: wait until its frames are extracted.', 'clip_not_ready');
      }
      const frameCount = clip.frame_count;
      const problems: { path: (string | number)[]; message: string }[] = [];
      input.landmarks.forEach((l, i) => {
        if (l.frame >= frameCount)
          problems.push({
            path: ['landmarks', i, 'frame'],
            message: `Frame ${l.frame} is beyond the clip's last frame (${frameCount - 1}).`,
          });
      });
      input.events.forEach((e, i) => {
        if (e.frame >= frameCount)
          problems.push({ path: ['events', i, 'frame'], message: `Frame ${e.frame} is beyond the clip's last frame (${frameCount - 1}).` });
      });
      if (input.scale && input.scale.frame >= frameCount)
        problems.push({ path: ['scale', 'frame'], message: `Frame ${input.scale.frame} is beyond the clip's last frame.` });
      input.gauges.forEach((g, i) => {
        if (g.frame >= frameCount)
          problems.push({
            path: ['gauges', i, 'frame'],
            message: `Angle gauge on frame ${g.frame} is beyond the clip's last frame (${frameCount - 1}).`,
          });
      });
      if (!problems.length) {
        for (const message of d.validateEvents(input.events, frameCount)) problems.push({ path: ['events'], message });
      }
      if (problems.length) throw new ValidationError(problems[0]!.message, problems);

      await db.transaction(async (trx) => {
        const row = await trx('clips').where({ id: clipId }).first<{ annotation_revision: number }>('annotation_revision');
        if (!row) throw new AppError(404, 'not_found', 'Clip not found.');
        if (row.annotation_revision !== input.baseRevision) {
          const current = await repo.read(trx, clipId);
          throw new AppError(
            409,
            'stale_revision',
            'Someone saved newer marks on this clip. The latest were loaded; your unsaved changes were re-applied on top.',
            { current },
          );
        }
        await repo.replace(trx, clipId, input);
        const at = new Date().toISOString();
        await trx('clips')
          .where({ id: clipId })
          .update({ annotation_revision: row.annotation_revision + 1, annotated_by: user.id, annotated_at: at });
        const saved = await repo.read(trx, clipId);
        await d.afterSave(trx, clip, saved);
        await audit(
          trx,
          {
            clinicId: user.clinicId,
            actorId: user.id,
            athleteId: clip.athlete_id,
            action: 'clip.annotated',
            detail: { clipId, revision: saved.revision },
          },
          at,
        );
      });
      return repo.read(db, clipId);
    },
  };
}

export type AnnotationsService = ReturnType<typeof annotationsService>;
