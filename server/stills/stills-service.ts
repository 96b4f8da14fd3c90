import fs from 'node:fs';
import path from 'node:path';
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
import type { JobQueue, Job, SubjectFailure } from '../jobs/job-queue';
import { PermanentJobError, type JobHandler } from '../jobs/worker';
import type { MediaStore } from '../storage/media-store';
import type { Mailer } from '../mail/mailer';
import { accessibleShared, setPublication } from '../sharing/shared-items';
import { FRAMES_DIR, frameFileName, readManifest } from '../media/manifest';
import type { ClipRow } from '../clips/clips-repository';
import type { ClipsService } from '../clips/clips-service';
import { annotationsRepository } from '../annotations/annotations-repository';
import { renderStill } from '../render/still-render';
import { STILL_CLIP_DELETED, stillFiles, stillsRepository as repo, type StillRow, type StoredPanel } from './stills-repository';

export const RENDER_STILL_JOB = 'render_still';
export const STILLS_DIR = 'stills';
const subjectOf = (id: number) => `still:${id}`;

export interface StillsDeps {
  db: Db;
  store: MediaStore;
  queue: JobQueue;
  clips: ClipsService;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
  wakeWorker: () => void;
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

/** Annotated stills: save (frozen overlay), render as a job, caption, publish, serve. */
export function stillsService(d: StillsDeps) {
  const { db } = d;
  const now = () => d.clock().toISOString();

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
    const manifest = await readManifest(d.store.clipDir(clip.id));
    const assessment = await db('assessments')
      .where({ id: clip.assessment_id })
      .first<{ kind: AssessmentKind; date: string }>('kind', 'date');
    const ms = manifest?.timestampsMs?.[frameIndex];
    return freezePanel({
      clip: { id: clip.id, assessmentId: clip.assessment_id, nearSide: clip.near_side, direction: clip.direction },
      assessment,
      annotations: await annotationsRepository.read(db, clip.id),
      frameIndex,
      frameSize: { width: manifest?.width ?? clip.width ?? 1, height: manifest?.height ?? clip.height ?? 1 },
      timeS: ms !== undefined ? ms / 1000 : frameIndex / (clip.fps ?? manifest?.fps ?? 30),
    });
  }

  async function queueRender(id: number, patch: Partial<StillRow>): Promise<void> {
    await db.transaction(async (trx) => {
      await trx('stills')
        .where({ id })
        .update({ ...patch, status: 'rendering', progress: 0, error: null, updated_at: now() });
      await d.queue.enqueue(trx, RENDER_STILL_JOB, subjectOf(id), { stillId: id });
    });
    d.wakeWorker();
  }

  async function removeFiles(row: StillRow, version: number): Promise<void> {
    if (row.clip_id === null) return;
    const dir = path.join(d.store.clipDir(row.clip_id), STILLS_DIR);
    const files = stillFiles(row.id, version);
    await fs.promises.rm(path.join(dir, files.png), { force: true });
    await fs.promises.rm(path.join(dir, files.jpeg), { force: true });
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
      let id = 0;
      await db.transaction(async (trx) => {
        id = await repo.insert(trx, {
          clinic_id: user.clinicId,
          athlete_id: clip.athlete_id,
          assessment_id: clip.assessment_id,
          clip_id: clip.id,
          kind: panels.length > 1 ? 'pair' : 'frame',
          panels: JSON.stringify(panels),
          caption: body.caption.trim(),
          show_angles: body.showAngles,
          status: 'rendering',
          progress: 0,
          error: null,
          width: null,
          height: null,
          layout: null,
          labels: null,
          render_version: 1,
          published_at: null,
          published_by: null,
          created_by: user.id,
          created_at: at,
          updated_at: at,
        });
        await d.queue.enqueue(trx, RENDER_STILL_JOB, subjectOf(id), { stillId: id });
      });
      d.wakeWorker();
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
      await queueRender(id, { caption: text, render_version: row.render_version + 1 });
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
      await d.queue.cancelSubject(subjectOf(id));
      await db('stills').where({ id }).delete();
      await removeFiles(row, row.render_version);
      await audit(db, {
        clinicId: user.clinicId,
        actorId: user.id,
        athleteId: row.athlete_id,
        action: 'still.deleted',
        detail: { stillId: id },
      });
    },

    /** Absolute path of a ready still's image; logs an athlete's view in the audit log. */
    async imagePath(user: SessionUser, id: number, format: 'png' | 'jpeg'): Promise<string> {
      const row = await accessibleStill(user, id);
      if (row.status !== 'ready' || row.clip_id === null) throw new NotFoundError('Still image');
      const files = stillFiles(id, row.render_version);
      const file = path.join(d.store.clipDir(row.clip_id), STILLS_DIR, format === 'png' ? files.png : files.jpeg);
      if (!fs.existsSync(file)) throw new NotFoundError('Still image');
      if (throughSelfGrant(user, 'still:read'))
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'still.viewed',
          detail: { stillId: id, format },
        });
      return file;
    },

    /** Files of a ready still (for summaries), or null when it has none. */
    async pngOf(id: number): Promise<{ file: string; row: StillRow } | null> {
      const row = await repo.findById(db, id);
      if (!row || row.status !== 'ready' || row.clip_id === null) return null;
      const file = path.join(d.store.clipDir(row.clip_id), STILLS_DIR, stillFiles(id, row.render_version).png);
      return fs.existsSync(file) ? { file, row } : null;
    },

    /** The render job: frames + frozen overlay → PNG and phone JPEG, with progress. */
    renderJob: (async (job: Job) => {
      const id = Number(job.payload['stillId']);
      const row = await repo.findById(db, id);
      if (!row) return; // deleted meanwhile
      if (row.clip_id === null) throw new PermanentJobError(STILL_CLIP_DELETED);
      const panels = repo.panels(row);
      // A still queued with its clip (the demo) waits for the frames: retried with back-off.
      const statuses = await db('clips')
        .whereIn(
          'id',
          panels.map((p) => p.clipId),
        )
        .pluck('status');
      if (statuses.some((st: string) => st !== 'ready')) throw new Error('The clip’s frames are not extracted yet.');
      const inputs = panels.map((p) => {
        const image = path.join(d.store.clipDir(p.clipId), FRAMES_DIR, frameFileName(p.frameIndex));
        if (!fs.existsSync(image))
          throw new PermanentJobError('A frame of this still is gone (its clip was deleted or re-processed). Save the still again.');
        return {
          image,
          frameSize: p.frameSize,
          landmarks: p.landmarks,
          nearSide: p.nearSide,
          direction: p.direction,
          scale: p.scale,
          gauges: p.gauges,
          heading: p.heading,
        };
      });
      const version = row.render_version;
      const out = await renderStill({
        panels: inputs,
        caption: row.caption,
        showAngles: Boolean(row.show_angles),
        onProgress: (f) => repo.update(db, id, { progress: Math.min(0.95, f) }),
      });
      const dir = path.join(d.store.clipDir(row.clip_id), STILLS_DIR);
      await fs.promises.mkdir(dir, { recursive: true });
      const files = stillFiles(id, version);
      // Write under temporary names, then rename: a reader never sees half a file.
      for (const [name, bytes] of [
        [files.png, out.png],
        [files.jpeg, out.jpeg],
      ] as const) {
        const tmp = path.join(dir, `.${name}.tmp`);
        await fs.promises.writeFile(tmp, bytes);
        await fs.promises.rename(tmp, path.join(dir, name));
      }
      const current = await repo.findById(db, id);
      if (!current || current.render_version !== version) {
        // Deleted or re-captioned meanwhile: these files belong to nobody.
        await removeFiles({ ...row }, version);
        return;
      }
      await repo.update(db, id, {
        status: 'ready',
        progress: 1,
        error: null,
        width: out.width,
        height: out.height,
        layout: JSON.stringify(out.layout),
        labels: JSON.stringify(out.labels),
        updated_at: now(),
      });
      if (version > 1) await removeFiles(current, version - 1);
    }) satisfies JobHandler,

    /** When the render job is over for good: the still is `failed` with the reason (unless it got ready). */
    renderFailure: {
      async fail(trx, job, reason) {
        await trx('stills')
          .where({ id: Number(job.payload['stillId']) })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: `The still could not be rendered: ${reason}`, updated_at: now() });
      },
    } satisfies SubjectFailure,
  };
}

export type StillsService = ReturnType<typeof stillsService>;
