import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import { ASSESSMENT_KIND_LABELS, type AssessmentKind, type Direction, type Side } from '../../src/contracts/assessment';
import { GAIT_EVENT_LABELS, type ClipAnnotations } from '../../src/contracts/annotations';
import type { Still, StillCreate } from '../../src/contracts/sharing';
import type { Db } from '../db/knex';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors';
import { audit } from '../audit/audit-log';
import type { Action } from '../policy/access-table';
import { accessibleAthlete } from '../policy/athlete-resources';
import { listGrant, throughSelfGrant } from '../policy/enforce';
import type { Processing } from '../processing/processing';
import { renderOnce } from '../processing/render-once';
import { clipKeys } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { readSmall } from '../storage/stored-objects';
import type { Mailer } from '../mail/mailer';
import { accessibleShared, deleteShared, setPublication } from '../sharing/shared-items';
import type { ClipRow } from '../clips/clips-repository';
import type { ClipsService } from '../clips/clips-service';
import { annotationsRepository } from '../annotations/annotations-repository';
import { STILL_CLIP_DELETED, stillsRepository as repo, type StillRow, type StoredPanel } from './stills-repository';
import { RENDER_STILL, removeStillImages, renderStillKind } from './render-still-kind';

export interface StillsDeps {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
}

/** A stored still image to send. */
export interface StillImage {
  key: string;
  type: 'image/png' | 'image/jpeg';
}

/**
 * Annotated stills: save (the overlay frozen as it is), render as the `render_still` processed
 * item, caption, publish, serve.
 */
export interface StillsService {
  /** A still this user may see: staff any of their clinic's; an athlete only their published ones. */
  accessibleStill(user: SessionUser, id: number): Promise<StillRow>;
  create(user: SessionUser, clipId: number, body: StillCreate): Promise<Still>;
  list(user: SessionUser, athleteId: number): Promise<Still[]>;
  get(user: SessionUser, id: number): Promise<Still>;
  /** A new caption is drawn on the image: a new render version is queued. */
  updateCaption(user: SessionUser, id: number, caption: string): Promise<Still>;
  setPublished(user: SessionUser, id: number, publish: boolean): Promise<Still>;
  remove(user: SessionUser, id: number): Promise<void>;
  /** The stored image of a ready still; logs an athlete's view in the audit log. */
  image(user: SessionUser, id: number, format: 'png' | 'jpeg'): Promise<StillImage>;
  /** The PNG bytes and row of a ready still (for summaries), or null when it has none. */
  pngOf(id: number): Promise<{ png: Buffer; row: StillRow } | null>;
}

/** "6 Oct 2026" from `2026-10-06`. */
export function displayDate(isoDate: string): string {
  const d = new Date(`${isoDate}T12:00:00Z`);
  return Number.isNaN(d.getTime())
    ? isoDate
    : d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

/**
 * A still's panel: one frame's landmarks, scale bar, angle gauges, side and direction frozen as they are now,
 * with the heading drawn above it ("Baseline · 6 Oct 2026 · Right toe-off · 0.85 s"). Pure.
 */
export function freezePanel(p: {
  clip: { id: number; assessmentId: number; nearSide: Side; direction: Direction };
  assessment: { kind: AssessmentKind; date: string };
  annotations: Pick<ClipAnnotations, 'landmarks' | 'events' | 'scale' | 'gauges'>;
  frameIndex: number;
  frameSize: { width: number; height: number };
  timeS: number;
}): StoredPanel {
  const label = `${ASSESSMENT_KIND_LABELS[p.assessment.kind]} · ${displayDate(p.assessment.date)}`;
  const events = p.annotations.events
    .filter((e) => e.frame === p.frameIndex)
    .map((e) => `${e.side === 'left' ? 'Left' : 'Right'} ${GAIT_EVENT_LABELS[e.kind].toLowerCase()}`);
  return {
    clipId: p.clip.id,
    assessmentId: p.clip.assessmentId,
    frameIndex: p.frameIndex,
    timeS: Math.round(p.timeS * 1000) / 1000,
    label,
    heading: [label, ...events, `${p.timeS.toFixed(2)} s`].join(' · '),
    frameSize: p.frameSize,
    landmarks: p.annotations.landmarks.filter((l) => l.frame === p.frameIndex),
    nearSide: p.clip.nearSide,
    direction: p.clip.direction,
    scale: p.annotations.scale && p.annotations.scale.frame === p.frameIndex ? p.annotations.scale : null,
    gauges: (p.annotations.gauges ?? []).filter((g) => g.frame === p.frameIndex),
  };
}

export function stillsService(d: StillsDeps): StillsService {
  const { db, processing } = d;
  const now = () => d.clock().toISOString();
  processing.register(renderStillKind(d));

  /** A still this user may reach for `action`: staff any of their clinic's; an athlete only their published ones. */
  const accessibleStill = (user: SessionUser, id: number, action: Action = 'still:read') =>
    accessibleShared<StillRow>(db, 'still', user, id, action, (row) => row.clip_id !== null);

  async function view(id: number): Promise<Still> {
    const [still] = await repo.view(db, { id }, { publishedOnly: false });
    if (!still) throw new NotFoundError('Still');
    return still;
  }

  /** Freezes one clip frame's overlay into a panel. */
  async function panelOf(clip: ClipRow, frameIndex: number, field: string): Promise<StoredPanel> {
    if (clip.status !== 'ready')
      throw new ConflictError('This clip is not ready yet: wait until its frames are extracted.', 'clip_not_ready');
    const count = clip.frame_count ?? 0;
    if (!Number.isInteger(frameIndex) || frameIndex < 0 || frameIndex >= count) {
      throw new ValidationError(`Frame ${frameIndex} is not in this clip (0–${Math.max(0, count - 1)}).`, [
        { path: field.split('.'), message: `Choose a frame from 0 to ${Math.max(0, count - 1)}.` },
      ]);
    }
    const manifest = await d.clips.manifest(clip.id);
    if (!manifest) throw new ConflictError('This clip’s frames are gone: process it again.', 'clip_not_ready');
    const assessment = await db('assessments')
      .where({ id: clip.assessment_id })
      .first<{ kind: AssessmentKind; date: string }>('kind', 'date');
    const ms = manifest.timestampsMs[frameIndex];
    return freezePanel({
      clip: { id: clip.id, assessmentId: clip.assessment_id, nearSide: clip.near_side, direction: clip.direction },
      assessment,
      annotations: await annotationsRepository.read(db, clip.id),
      frameIndex,
      frameSize: { width: manifest.width, height: manifest.height },
      timeS: ms !== undefined ? ms / 1000 : frameIndex / manifest.fps,
    });
  }

  async function queueRender(row: StillRow, patch: Partial<StillRow>): Promise<void> {
    await db.transaction(async (trx) => {
      await trx('stills')
        .where({ id: row.id })
        .update({ ...patch, updated_at: now() });
      await processing.enqueue(trx, RENDER_STILL, row.id, { clinicId: row.clinic_id, athleteId: row.athlete_id });
    });
  }

  return {
    accessibleStill,

    async create(user: SessionUser, clipId: number, body: StillCreate): Promise<Still> {
      const clip = await d.clips.accessibleClip(user, clipId, 'still:create');
      const main = await panelOf(clip, body.frameIndex, 'frameIndex');
      const panels = [main];
      if (body.pairWith) {
        if (body.pairWith.clipId === clipId)
          throw new ValidationError('Pair this frame with a clip of another assessment.', [
            { path: ['pairWith', 'clipId'], message: 'Choose the other visit’s clip.' },
          ]);
        const other = await d.clips.accessibleClip(user, body.pairWith.clipId, 'still:create').catch(() => {
          throw new ValidationError('The clip to pair with was not found.', [{ path: ['pairWith', 'clipId'], message: 'Clip not found.' }]);
        });
        if (other.athlete_id !== clip.athlete_id)
          throw new AppError(422, 'other_athlete', 'Both clips of a side-by-side still must belong to the same athlete.');
        // Baseline (the other clip) on the left, the Re-test on the right.
        panels.unshift(await panelOf(other, body.pairWith.frameIndex, 'pairWith.frameIndex'));
      }
      const at = now();
      // Identical: the same clip and frame(s) with the same marks frozen (`panels`), caption and angles, a new still
      // not yet rendered; asked for again then (a double click, a retry) it is that still, not a second render.
      const same = {
        clinic_id: user.clinicId,
        clip_id: clip.id,
        kind: panels.length > 1 ? 'pair' : 'frame',
        panels: JSON.stringify(panels),
        caption: body.caption.trim(),
        show_angles: body.showAngles,
        render_version: 1,
      };
      const { id, made } = await renderOnce(db, processing, {
        table: 'stills',
        lock: (trx) => trx('clips').where({ id: clip.id }).select('id'),
        same,
        kind: RENDER_STILL,
        scope: { clinicId: user.clinicId, athleteId: clip.athlete_id },
        insert: (trx) =>
          repo.insert(trx, {
            ...same,
            kind: same.kind as 'pair' | 'frame',
            athlete_id: clip.athlete_id,
            assessment_id: clip.assessment_id,
            status: 'rendering',
            error: null,
            width: null,
            height: null,
            layout: null,
            labels: null,
            published_at: null,
            published_by: null,
            created_by: user.id,
            created_at: at,
            updated_at: at,
          }),
      });
      if (made)
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: clip.athlete_id,
          action: 'still.created',
          detail: { stillId: id, clipId },
        });
      return view(id);
    },

    async list(user: SessionUser, athleteId: number): Promise<Still[]> {
      await accessibleAthlete(db, user, athleteId, 'still:list');
      const publishedOnly = listGrant(user, 'still:list').when.includes('published');
      return repo.view(db, { athlete_id: athleteId, clinic_id: user.clinicId }, { publishedOnly });
    },

    async get(user: SessionUser, id: number): Promise<Still> {
      await accessibleStill(user, id);
      return view(id);
    },

    async updateCaption(user: SessionUser, id: number, caption: string): Promise<Still> {
      const row = await accessibleStill(user, id, 'still:update');
      if (row.clip_id === null) throw new ConflictError(STILL_CLIP_DELETED, 'clip_deleted');
      const text = caption.trim();
      if (text === row.caption) return view(id);
      // The caption is drawn on the image: render a new version; the old files go when it is ready.
      await queueRender(row, { caption: text, render_version: row.render_version + 1 });
      return view(id);
    },

    async setPublished(user: SessionUser, id: number, publish: boolean): Promise<Still> {
      const row = await accessibleStill(user, id, 'still:publish');
      if (publish && row.clip_id === null) throw new ConflictError(STILL_CLIP_DELETED, 'clip_deleted');
      if (publish && row.status !== 'ready')
        throw new ConflictError(
          row.status === 'failed'
            ? 'This still could not be rendered; delete it and save it again.'
            : 'This still is still rendering: publish it when it is ready.',
          'still_not_ready',
        );
      await setPublication(d, 'still', user, row, publish);
      return view(id);
    },

    async remove(user: SessionUser, id: number): Promise<void> {
      const row = await accessibleStill(user, id, 'still:delete');
      await deleteShared(d, 'still', user, row, () => removeStillImages(d.store, row, row.render_version));
    },

    async image(user, id, format) {
      const row = await accessibleStill(user, id);
      if (row.status !== 'ready' || row.clip_id === null) throw new NotFoundError('Still image');
      const key = clipKeys(row.clip_id).still(id, row.render_version, format);
      if (!(await d.store.stat(key))) throw new NotFoundError('Still image');
      if (throughSelfGrant(user, 'still:read'))
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'still.viewed',
          detail: { stillId: id, format },
        });
      return { key, type: format === 'png' ? 'image/png' : 'image/jpeg' };
    },

    async pngOf(id) {
      const row = await repo.findById(db, id);
      if (!row || row.status !== 'ready' || row.clip_id === null) return null;
      const png = await readSmall(d.store, clipKeys(row.clip_id).still(id, row.render_version, 'png')).catch(() => null);
      return png ? { png, row } : null;
    },
  };
}
