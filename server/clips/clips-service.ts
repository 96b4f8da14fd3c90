import fs from 'node:fs';
import path from 'node:path';
import type { Logger } from 'pino';
import type { Clip, SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { AppError, ConflictError, NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import { cleanFileName } from '../http/file-names';
import type { Action } from '../policy/access-table';
import { assertAthleteResource } from '../policy/athlete-resources';
import { assertRole, assertState } from '../policy/enforce';
import { assessmentsRepository } from '../assessments/assessments-repository';
import type { MediaStore } from '../storage/media-store';
import type { Job, JobQueue, SubjectFailure } from '../jobs/job-queue';
import { PermanentJobError, type JobHandler } from '../jobs/worker';
import { probeVideo } from '../media/probe';
import { extractFrames } from '../media/extract';
import { SNIFF_BYTES, sniffContainer } from '../media/magic';
import { MediaError } from '../media/media-error';
import { FRAMES_DIR, MANIFEST_FILE, THUMBS_DIR, frameFileName } from '../media/manifest';
import { clipsRepository as repo, type ClipRow } from './clips-repository';
import type { ClipEvents } from './clip-events';
import type { ClipPatch } from './clips-schemas';

export const EXTRACT_JOB = 'extract_clip';
const subjectOf = (clipId: number) => `clip:${clipId}`;

export interface ClipsDeps {
  db: Db;
  store: MediaStore;
  queue: JobQueue;
  events: ClipEvents;
  logger: Logger;
  /** Tells the worker there is work (no-op when no worker runs in this process). */
  wakeWorker: () => void;
  /** Aborts a running job of a subject. */
  cancelJob: (subject: string) => void;
}

/** A file multer stored in the temp folder. */
export interface UploadedFile {
  path: string;
  originalname: string;
  size: number;
}

/** Clip upload, settings, deletion, processing and media access. */
export function clipsService(d: ClipsDeps) {
  const { db, store } = d;

  async function emit(clipId: number): Promise<void> {
    const row = await repo.findById(db, clipId);
    if (row) d.events.emit(row.assessment_id, clipId);
  }

  /** The assessment this user may reach for `action` (see `server/policy/access-table.ts`); 404 otherwise. */
  async function accessibleAssessment(user: SessionUser, assessmentId: number, action: Action = 'assessment:read') {
    assertRole(user, action);
    const row = await assessmentsRepository.find(db, user.clinicId, assessmentId);
    if (!row) throw new NotFoundError('Assessment');
    await assertAthleteResource(db, user, action, row, 'Assessment');
    return row;
  }

  /** The clip this user may reach for `action`; 404 otherwise (its state is checked where it is known). */
  async function accessibleClip(user: SessionUser, clipId: number, action: Action = 'clip:read'): Promise<ClipRow> {
    assertRole(user, action);
    const row = await repo.find(db, user.clinicId, clipId);
    if (!row) throw new NotFoundError('Clip');
    await assertAthleteResource(db, user, action, row, 'Clip');
    return row;
  }

  async function requireVideoConsent(athleteId: number): Promise<void> {
    const consent = await db('consents')
      .where({ athlete_id: athleteId, kind: 'video_recording' })
      .orderBy('id', 'desc')
      .first<{ granted: number } | undefined>();
    if (!consent?.granted) {
      throw new ConflictError(
        'Record the athlete’s consent to video recording (in the intake) before uploading clips.',
        'consent_required',
      );
    }
  }

  async function view(clipId: number): Promise<Clip> {
    const clip = await repo.view(db, clipId);
    if (!clip) throw new NotFoundError('Clip');
    return clip;
  }

  /** Deletes clips' jobs, rows and folders (also used when an assessment goes). */
  async function removeClips(rows: Pick<ClipRow, 'id' | 'assessment_id'>[]): Promise<void> {
    for (const row of rows) {
      await d.queue.cancelSubject(subjectOf(row.id));
      d.cancelJob(subjectOf(row.id));
      await db('clips').where({ id: row.id }).delete();
      await store.removeClip(row.id);
      d.events.emit(row.assessment_id, row.id);
    }
  }

  return {
    accessibleAssessment,
    accessibleClip,

    /** Checks run before the upload body is read: access and consent. */
    async beforeUpload(user: SessionUser, assessmentId: number) {
      const assessment = await accessibleAssessment(user, assessmentId, 'clip:upload');
      await requireVideoConsent(assessment.athlete_id);
      return assessment;
    },

    /**
     * Accepts an uploaded temp file: content decides whether it is a video (magic bytes, then
     * ffprobe); the clip row and its job are created in one transaction, inside which the file
     * moves to the clip's folder. Whatever is refused leaves no file and no row.
     */
    async acceptUpload(user: SessionUser, assessmentId: number, file: UploadedFile): Promise<Clip> {
      try {
        const assessment = await accessibleAssessment(user, assessmentId, 'clip:upload');
        await requireVideoConsent(assessment.athlete_id);
        if (file.size === 0) throw new MediaError('empty_file', 'The uploaded file is empty.', 'size 0');
        const head = Buffer.alloc(Math.min(file.size, SNIFF_BYTES));
        const fh = await fs.promises.open(file.path, 'r');
        try {
          await fh.read(head, 0, head.length, 0);
        } finally {
          await fh.close();
        }
        const container = sniffContainer(head);
        if (!container) {
          throw new MediaError(
            'not_video',
            'This file is not a video we can read. Upload an MP4, MOV, WebM, MKV, AVI or 3GP clip.',
            'unknown magic bytes',
          );
        }
        const probe = await probeVideo(file.path);
        const at = new Date().toISOString();
        let clipId = 0;
        await db.transaction(async (trx) => {
          clipId = await repo.insert(trx, {
            clinic_id: user.clinicId,
            athlete_id: assessment.athlete_id,
            assessment_id: assessment.id,
            uploaded_by: user.id,
            original_name: cleanFileName(file.originalname),
            stored_name: `original.${container}`,
            size_bytes: file.size,
            container,
            status: 'queued',
            progress_done: null,
            progress_total: probe.frameCount,
            error: null,
            near_side: 'right',
            direction: 'left_to_right',
            capture_fps: null,
            fps: probe.fps,
            width: probe.displayWidth,
            height: probe.displayHeight,
            frame_count: probe.frameCount,
            duration_s: probe.durationS,
            rotation: probe.rotation,
            codec: probe.codec,
            thumb_count: 0,
            thumb_every: null,
            created_at: at,
            updated_at: at,
          });
          await d.queue.enqueue(trx, EXTRACT_JOB, subjectOf(clipId), { clipId });
          await audit(
            trx,
            {
              clinicId: user.clinicId,
              actorId: user.id,
              athleteId: assessment.athlete_id,
              action: 'clip.uploaded',
              detail: { clipId, assessmentId, bytes: file.size },
            },
            at,
          );
          // Last step inside the transaction: if the move fails, no row is committed.
          await store.adopt(file.path, clipId, `original.${container}`);
        });
        d.wakeWorker();
        return view(clipId);
      } finally {
        await fs.promises.rm(file.path, { force: true });
      }
    },

    list: async (user: SessionUser, assessmentId: number) => {
      await accessibleAssessment(user, assessmentId, 'clip:read');
      return repo.listForAssessment(db, assessmentId);
    },

    async get(user: SessionUser, clipId: number): Promise<Clip> {
      await accessibleClip(user, clipId);
      return view(clipId);
    },

    /**
     * Changes near side, running direction or capture rate, as the policy's `clip:update-settings`
     * allows (an athlete only while the clip is not marked); each change is audited with its old and new value, and a marked clip's measures
     * snapshot is dropped (recomputed with the new settings on the next read).
     */
    async update(user: SessionUser, clipId: number, patch: ClipPatch): Promise<Clip> {
      const current = await accessibleClip(user, clipId, 'clip:update-settings');
      const fields = [
        ['nearSide', 'near_side'],
        ['direction', 'direction'],
        ['captureFps', 'capture_fps'],
      ] as const;
      const row: Partial<ClipRow> = {};
      const changes: Record<string, { from: unknown; to: unknown }> = {};
      for (const [key, column] of fields) {
        const to = patch[key];
        if (to === undefined || to === current[column]) continue;
        (row as Record<string, unknown>)[column] = to;
        changes[key] = { from: current[column], to };
      }
      if (Object.keys(changes).length === 0) return view(clipId);
      await db.transaction(async (trx) => {
        // Checked inside the write, so marks saved meanwhile are seen.
        assertState(user, 'clip:update-settings', { marked: await repo.isMarked(trx, clipId) }, 'Clip');
        await repo.update(trx, clipId, row);
        await trx('measure_snapshots').where({ clip_id: clipId }).delete();
        await audit(trx, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: current.athlete_id,
          action: 'clip.settings_changed',
          detail: { clipId, changes },
        });
      });
      await emit(clipId);
      return view(clipId);
    },

    async remove(user: SessionUser, clipId: number): Promise<void> {
      const row = await accessibleClip(user, clipId, 'clip:delete');
      assertState(user, 'clip:delete', { uploadedBy: row.uploaded_by }, 'Clip');
      await removeClips([row]);
      await audit(db, { clinicId: user.clinicId, actorId: user.id, athleteId: row.athlete_id, action: 'clip.deleted', detail: { clipId } });
    },

    removeClips,

    async retry(user: SessionUser, clipId: number): Promise<Clip> {
      const row = await accessibleClip(user, clipId, 'clip:retry');
      if (row.status !== 'failed') throw new ConflictError('Only a clip whose processing failed can be retried.', 'not_failed');
      await db.transaction(async (trx) => {
        await repo.update(trx, clipId, { status: 'queued', error: null, progress_done: null });
        await d.queue.enqueue(trx, EXTRACT_JOB, subjectOf(clipId), { clipId });
      });
      d.wakeWorker();
      await emit(clipId);
      return view(clipId);
    },

    /** Absolute path of a media file of a clip the user may see, or 404. */
    async mediaPath(
      user: SessionUser,
      clipId: number,
      kind: 'frame' | 'thumb' | 'poster' | 'manifest' | 'original',
      n = 0,
    ): Promise<{ file: string; row: ClipRow }> {
      const row = await accessibleClip(user, clipId, 'clip:read-media');
      const dir = store.clipDir(clipId);
      let file: string;
      if (kind === 'original') file = path.join(dir, row.stored_name);
      else {
        if (row.status !== 'ready') throw new NotFoundError('Frame');
        if (kind === 'manifest') file = path.join(dir, MANIFEST_FILE);
        else if (kind === 'frame') {
          if (n >= (row.frame_count ?? 0)) throw new NotFoundError('Frame');
          file = path.join(dir, FRAMES_DIR, frameFileName(n));
        } else {
          const index = kind === 'poster' ? Math.floor(row.thumb_count / 2) : n;
          if (index >= row.thumb_count) throw new NotFoundError('Thumbnail');
          file = path.join(dir, THUMBS_DIR, frameFileName(index));
        }
      }
      if (!fs.existsSync(file)) throw new NotFoundError('File');
      return { file, row };
    },

    /** The job handler: probe, extract every frame with progress, mark ready. */
    processJob: (async (job: Job, { signal }) => {
      const clipId = Number(job.payload['clipId']);
      const row = await repo.findById(db, clipId);
      if (!row) return; // deleted meanwhile
      const dir = store.clipDir(clipId);
      // A worker killed mid-extraction leaves a staging folder behind.
      for (const f of await fs.promises.readdir(dir).catch(() => [] as string[])) {
        if (f.startsWith('.extract-')) await fs.promises.rm(path.join(dir, f), { recursive: true, force: true });
      }
      const original = path.join(dir, row.stored_name);
      try {
        await repo.update(db, clipId, { status: 'probing', error: null, progress_done: null });
        await emit(clipId);
        const probe = await probeVideo(original);
        await repo.update(db, clipId, { status: 'extracting', progress_done: 0, progress_total: probe.frameCount });
        await emit(clipId);
        let last = 0;
        const manifest = await extractFrames(original, dir, {
          probe,
          signal,
          onProgress: (done, total) => {
            const now = Date.now();
            if (now - last < 250 && done < total) return;
            last = now;
            void repo
              .update(db, clipId, { progress_done: done, progress_total: total })
              .then(() => emit(clipId))
              .catch(() => undefined);
          },
        });
        if (!(await repo.findById(db, clipId))) {
          await store.removeClip(clipId);
          return;
        }
        await repo.update(db, clipId, {
          status: 'ready',
          error: null,
          progress_done: manifest.frameCount,
          progress_total: manifest.frameCount,
          width: manifest.width,
          height: manifest.height,
          frame_count: manifest.frameCount,
          fps: manifest.fps,
          duration_s: manifest.durationS,
          rotation: manifest.rotationApplied,
          thumb_count: manifest.thumbCount,
          thumb_every: manifest.thumbEvery,
        });
        await emit(clipId);
      } catch (err) {
        if (err instanceof MediaError && err.code !== 'tool_missing' && err.code !== 'aborted') {
          d.logger.warn({ clipId, reason: err.reason }, 'clip processing failed');
          throw new PermanentJobError(err.message);
        }
        const attemptsLeft = job.maxAttempts - job.attempts;
        if (attemptsLeft > 0 && !signal.aborted) {
          await repo
            .update(db, clipId, { status: 'queued', error: `Attempt ${job.attempts} failed; trying again shortly.` })
            .catch(() => undefined);
          await emit(clipId).catch(() => undefined);
        }
        throw err;
      }
    }) satisfies JobHandler,

    /** When the extraction job is over for good: the clip is `failed` with the reason (unless it got ready). */
    extractFailure: {
      async fail(trx, job, reason) {
        await trx('clips')
          .where({ id: Number(job.payload['clipId']) })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: reason.slice(0, 500), updated_at: new Date().toISOString() });
      },
      failed: (job) => void emit(Number(job.payload['clipId'])).catch(() => undefined),
    } satisfies SubjectFailure,
  };
}

export type ClipsService = ReturnType<typeof clipsService>;

/** 413 for uploads over the configured limit. */
export function tooLarge(limitBytes: number): AppError {
  const mb = Math.round(limitBytes / 1024 / 1024);
  return new AppError(
    413,
    'file_too_large',
    `This file is larger than the ${mb >= 1024 ? `${(mb / 1024).toFixed(1)} GB` : `${mb} MB`} upload limit. Trim the clip to 10–20 seconds and try again.`,
  );
}
