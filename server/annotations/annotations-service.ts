import { MIN_SCALE_LINE_PX, type ClipAnnotations, type EventProposalsResult, type NotFollowedPoint } from '../../src/contracts/annotations';
import { mergeProposals, minProposalFrames, proposeGaitEvents, PROPOSAL_MIN_SECONDS, scaleBarPixelLength } from '../../src/kinematics';
import type { SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { AppError, ConflictError, ValidationError } from '../errors';
import { audit } from '../audit/audit-log';
import type { ClipsService } from '../clips/clips-service';
import { clipsRepository, type ClipRow } from '../clips/clips-repository';
import { annotationsRepository as repo } from './annotations-repository';
import type { AnnotationsInput } from './annotations-schemas';
import { normalizeMarks, notFollowedAfter, sameScale } from './annotation-changes';

export interface AnnotationsDeps {
  db: Db;
  clips: ClipsService;
  /** Checks event order; returns problems in words (from src/kinematics). */
  validateEvents: (events: AnnotationsInput['events'], frameCount: number) => string[];
}

/** Clips whose last saved marks are kept in memory (a few hundred annotators at once). */
const LAST_SAVED_KEPT = 500;

/**
 * The marks of each clip's last save from this process, by clip, so the next autosave of an
 * annotator need not read them back. An entry is used only for the revision it was saved as, and
 * the save's transaction checks that this revision is still the stored one; every change to a
 * clip's marks raises its revision, so a kept entry is never taken for different stored marks.
 */
function savedMarks(max: number) {
  const kept = new Map<number, ClipAnnotations>();
  return {
    at(clipId: number, revision: number): ClipAnnotations | undefined {
      const hit = kept.get(clipId);
      return hit?.revision === revision ? hit : undefined;
    },
    keep(saved: ClipAnnotations): void {
      kept.delete(saved.clipId);
      kept.set(saved.clipId, saved);
      if (kept.size > max) kept.delete(kept.keys().next().value!);
    },
  };
}

/** 409 `stale_revision` with the marks now stored. */
function staleRevision(current: ClipAnnotations): AppError {
  return new AppError(
    409,
    'stale_revision',
    'Someone saved newer marks on this clip. The latest were loaded; your unsaved changes were re-applied on top.',
    { current },
  );
}

/**
 * A clip's landmarks, events, scale and angle gauges, saved whole with optimistic concurrency
 * (each save names the revision it was based on; only what changed is written).
 */
export function annotationsService(d: AnnotationsDeps) {
  const { db } = d;
  const lastSaved = savedMarks(LAST_SAVED_KEPT);

  /**
   * Saves `input` as the clip's marks when `baseRevision` is still the stored one (else 409
   * `stale_revision` with the stored copy): writes only what changed, raises the revision and
   * audits `action`, in one transaction. Returns the saved copy. The measures are not computed
   * here: the next read of them finds their snapshot older than the revision and computes them
   * (see `measures-service.ts`), so an autosave every few seconds does not compute them each time.
   * The frames not followed go with the marks: `followed` (a follow run) turns the stored list
   * into the run's, and a marker a person placed or accepted on a frame clears that frame's entry.
   */
  async function save(
    user: Pick<SessionUser, 'id' | 'name' | 'clinicId'>,
    clip: ClipRow,
    baseRevision: number,
    input: Parameters<typeof normalizeMarks>[0],
    action: string,
    detail: Record<string, unknown>,
    followed?: (stored: NotFollowedPoint[]) => NotFollowedPoint[],
  ): Promise<ClipAnnotations> {
    const clipId = clip.id;
    // What is stored now, known before the transaction: the save is checked against it and its
    // changes found before the one writing connection is taken.
    const stored = lastSaved.at(clipId, baseRevision) ?? (await repo.read(db, clipId));
    if (stored.revision !== baseRevision) throw staleRevision(stored);
    const marks = normalizeMarks(input);
    const storedNotFollowed = stored.notFollowed ?? [];
    const notFollowed = notFollowedAfter(followed ? followed(storedNotFollowed) : storedNotFollowed, marks.landmarks);
    const checked = followed ? 0 : storedNotFollowed.length - notFollowed.length;
    const at = new Date().toISOString();
    const saved: ClipAnnotations = {
      clipId,
      revision: stored.revision + 1,
      ...marks,
      notFollowed,
      updatedAt: at,
      updatedByName: user.name,
    };

    await db.transaction(async (trx) => {
      // Raising the revision only from the one read takes the clip row's lock first: a save racing from the same
      // revision waits for this one (PostgreSQL) or for the single writer (SQLite), then moves no row and is stale.
      const moved = await trx('clips')
        .where({ id: clipId, annotation_revision: stored.revision })
        .update({ annotation_revision: saved.revision, annotated_by: user.id, annotated_at: at });
      if (moved === 0) {
        if (!(await trx('clips').where({ id: clipId }).first('id'))) throw new AppError(404, 'not_found', 'Clip not found.');
        // Another save since the read: the marks read are not what is stored any more.
        throw staleRevision(await repo.read(trx, clipId));
      }
      await repo.applyChanges(trx, clipId, { ...stored, gauges: stored.gauges ?? [] }, marks);
      await repo.applyNotFollowed(trx, clipId, storedNotFollowed, notFollowed);
      await audit(
        trx,
        {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: clip.athlete_id,
          action,
          detail: { clipId, revision: saved.revision, ...detail, ...(checked > 0 ? { notFollowedChecked: checked } : {}) },
        },
        at,
      );
    });
    lastSaved.keep(saved);
    return saved;
  }

  async function readyClip(
    user: SessionUser,
    clipId: number,
    action: 'annotation:write' | 'event:propose',
  ): Promise<ClipRow & { frame_count: number }> {
    const clip = await d.clips.accessibleClip(user, clipId, action);
    if (clip.status !== 'ready' || !clip.frame_count) {
      throw new ConflictError('This clip is not ready yet: wait until its frames are extracted.', 'clip_not_ready');
    }
    return clip as ClipRow & { frame_count: number };
  }

  return {
    /** The clip's marks without an access check: for background work already checked when it was asked for. */
    read(clipId: number): Promise<ClipAnnotations> {
      return repo.read(db, clipId);
    },

    async get(user: SessionUser, clipId: number): Promise<ClipAnnotations> {
      await d.clips.accessibleClip(user, clipId, 'annotation:read');
      return repo.read(db, clipId);
    },

    /**
     * Saves the clip's current landmarks as `change` turns them, on behalf of `actor` (background
     * work a person asked for, such as marker following): read, changed and saved on the stored
     * revision, read again when another save came in between (up to three times). `followed`, for a
     * follow run, turns the stored frames not followed into the run's (see `save`).
     */
    async changeLandmarks(
      actor: Pick<SessionUser, 'id' | 'name' | 'clinicId'>,
      clipId: number,
      change: (landmarks: ClipAnnotations['landmarks']) => ClipAnnotations['landmarks'],
      action: string,
      detail: Record<string, unknown>,
      followed?: (stored: NotFollowedPoint[]) => NotFollowedPoint[],
    ): Promise<ClipAnnotations> {
      for (let attempt = 1; ; attempt++) {
        const clip = await clipsRepository.findById(db, clipId);
        if (!clip) throw new AppError(404, 'not_found', 'Clip not found.');
        const current = await repo.read(db, clipId);
        try {
          return await save(actor, clip, current.revision, { ...current, landmarks: change(current.landmarks) }, action, detail, followed);
        } catch (err) {
          if (!(err instanceof AppError && err.code === 'stale_revision') || attempt >= 3) throw err;
        }
      }
    },

    async put(user: SessionUser, clipId: number, input: AnnotationsInput): Promise<ClipAnnotations> {
      const clip = await readyClip(user, clipId, 'annotation:write');
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
      else if (input.scale && clip.width && clip.height) {
        const px = scaleBarPixelLength(input.scale, { width: clip.width, height: clip.height });
        // A bar saved before this minimum was enforced may be sent back unchanged with other marks.
        if (
          px < MIN_SCALE_LINE_PX &&
          !sameScale(input.scale, (lastSaved.at(clipId, input.baseRevision) ?? (await repo.read(db, clipId))).scale)
        )
          problems.push({
            path: ['scale', 'b'],
            message: `The scale bar is ${Math.round(px * 10) / 10} px long; it must be at least ${MIN_SCALE_LINE_PX} px of the frame: draw it along a longer object.`,
          });
      }
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

      return save(user, clip, input.baseRevision, input, 'clip.annotated', {});
    },
    /**
     * Proposes initial contacts and toe-offs from the clip's landmarks (`src/kinematics`) and saves
     * them as proposals: earlier proposals not yet accepted are replaced, placed and accepted events
     * stay as they are. 422 `too_few_landmarked_frames` when no side has hip, heel and toe on enough
     * frames in a row; 422 `no_events_found` when none could be found.
     */
    async proposeEvents(user: SessionUser, clipId: number, baseRevision: number): Promise<EventProposalsResult> {
      const clip = await readyClip(user, clipId, 'event:propose');
      const current = lastSaved.at(clipId, baseRevision) ?? (await repo.read(db, clipId));
      if (current.revision !== baseRevision) throw staleRevision(current);
      const fps = clip.capture_fps ?? clip.fps ?? 30;
      const plane = { frameSize: { width: clip.width ?? 1, height: clip.height ?? 1 }, direction: clip.direction };
      const found = proposeGaitEvents(current.landmarks, plane, fps, clip.frame_count);
      const need = minProposalFrames(fps);
      const longest = Math.max(found.usableRun.left, found.usableRun.right);
      if (longest < need)
        throw new AppError(
          422,
          'too_few_landmarked_frames',
          `Proposing events needs hip, heel and toe on at least ${need} frames in a row for one side (${PROPOSAL_MIN_SECONDS} s, one slow stride); ` +
            `the longest run on this clip is ${longest} frame${longest === 1 ? '' : 's'}. Nothing was changed.`,
          { need, longest },
        );
      if (!found.events.length)
        throw new AppError(
          422,
          'no_events_found',
          'No initial contact or toe-off could be found in the landmarked frames: hip, heel and toe must be marked over at least one whole stride. Nothing was changed.',
        );
      const merged = mergeProposals(current.events, found.events, fps, clip.frame_count);
      const byRule: EventProposalsResult['byRule'] = {};
      for (const e of found.events)
        if (merged.events.some((m) => m.origin === 'proposed' && m.frame === e.frame && m.side === e.side && m.kind === e.kind))
          byRule[e.rule] = (byRule[e.rule] ?? 0) + 1;
      const annotations = await save(
        user,
        clip,
        baseRevision,
        { landmarks: current.landmarks, events: merged.events, scale: current.scale, gauges: current.gauges ?? [] },
        'clip.events_proposed',
        { proposed: merged.added },
      );
      return { annotations, proposed: merged.added, byRule, skipped: merged.skipped };
    },
  };
}

export type AnnotationsService = ReturnType<typeof annotationsService>;
