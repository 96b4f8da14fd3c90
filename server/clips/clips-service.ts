import type { Logger } from 'pino';
import type { Clip, SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { lockedForUpdate } from '../db/dialect';
import { ConflictError, NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import { cleanFileName } from '../http/file-names';
import type { Action } from '../policy/access-table';
import { assertAthleteResource } from '../policy/athlete-resources';
import { assertRole, assertState } from '../policy/enforce';
import { assessmentsRepository, type AssessmentRow } from '../assessments/assessments-repository';
import { plannedManifest } from '../media/extract-plan';
import { checkVideoUpload } from '../media/check-video-upload';
import type { ClipManifest } from '../media/manifest';
import type { Processing } from '../processing/processing';
import { clipKeys } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { putJson, readJson } from '../storage/stored-objects';
import { removeUpload } from '../storage/upload-temps';
import { clipFacts } from './clip-facts';
import { clipMediaKey, type ClipMedia, type ClipMediaWhat } from './clip-media';
import { clipsRepository as repo, type ClipRow } from './clips-repository';
import type { ClipPatch } from './clips-schemas';
import { EXTRACT_FRAMES, extractFramesKind } from './extract-frames-kind';
import { readyManifests } from './ready-manifests';
import { cancelRendersOfClip } from '../sharing/renders-of-clip';

export interface ClipsDeps {
  db: Db;
  store: MediaStore;
  processing: Processing;
  logger: Logger;
}

/** A file multer stored in the temp folder. */
export interface UploadedFile {
  path: string;
  originalname: string;
  size: number;
}

/**
 * Clips of assessments: upload, settings, deletion, frame extraction (registered as the
 * `extract_frames` processed item) and which stored media a request may read.
 */
export interface ClipsService {
  /** The assessment this user may reach for `action` (see `server/policy/access-table.ts`); 404 otherwise. */
  accessibleAssessment(user: SessionUser, assessmentId: number, action?: Action): Promise<AssessmentRow>;
  /** The clip this user may reach for `action`; 404 otherwise (its state is checked where it is known). */
  accessibleClip(user: SessionUser, clipId: number, action?: Action): Promise<ClipRow>;
  /** Checks run before the upload body is read: access and consent. */
  beforeUpload(user: SessionUser, assessmentId: number): Promise<AssessmentRow>;
  /**
   * Accepts an uploaded temp file: content decides whether it is a video (magic bytes, then
   * ffprobe); the clip row, its planned manifest and its processed item are created in one
   * transaction, inside which the file moves to the clip's key. Whatever is refused leaves no
   * object and no row.
   */
  acceptUpload(user: SessionUser, assessmentId: number, file: UploadedFile): Promise<Clip>;
  list(user: SessionUser, assessmentId: number): Promise<Clip[]>;
  get(user: SessionUser, clipId: number): Promise<Clip>;
  /** Changes near side, running direction or capture rate (audited; drops the measures snapshot). */
  update(user: SessionUser, clipId: number, patch: ClipPatch): Promise<Clip>;
  remove(user: SessionUser, clipId: number): Promise<void>;
  /** Deletes clips' processing, rows and media (also when their assessment goes). */
  removeClips(rows: Pick<ClipRow, 'id' | 'assessment_id'>[]): Promise<void>;
  /** Queues a failed clip's extraction again. */
  retry(user: SessionUser, clipId: number): Promise<Clip>;
  /** The stored object a media route sends (frames while extracting too; 409 for one not there yet). */
  media(user: SessionUser, clipId: number, what: ClipMediaWhat, n?: number): Promise<ClipMedia>;
  /** A clip's manifest (no access check: callers check), or null before any exists. */
  manifest(clipId: number): Promise<ClipManifest | null>;
  /** The manifest of a clip row just read: a ready clip's is kept in memory ({@link readyManifests}); treat it as read-only. */
  manifestOf(clip: Pick<ClipRow, 'id' | 'status' | 'updated_at'>): Promise<ClipManifest | null>;
}

export function clipsService(d: ClipsDeps): ClipsService {
  const { db, store, processing } = d;
  processing.register(extractFramesKind(d));

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
    if (consent && !consent.granted) {
      throw new ConflictError(
        'Consent to video recording was withdrawn: uploads are stopped until the athlete gives it again (in the intake).',
        'consent_required',
      );
    }
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

  async function removeClips(rows: Pick<ClipRow, 'id' | 'assessment_id'>[]): Promise<void> {
    for (const row of rows) {
      await processing.cancel('clip', row.id);
      await cancelRendersOfClip(db, processing, row.id);
      // Files before the row: a server stop halfway leaves the row, so deleting again removes the
      // rest (never files no row names). Once more after the row, for frames an extraction running
      // elsewhere wrote meanwhile (it removes its own once it finds the row gone).
      await store.removePrefix(clipKeys(row.id).prefix);
      await db('clips').where({ id: row.id }).delete();
      await store.removePrefix(clipKeys(row.id).prefix);
    }
  }

  return {
    accessibleAssessment,
    accessibleClip,

    async beforeUpload(user, assessmentId) {
      const assessment = await accessibleAssessment(user, assessmentId, 'clip:upload');
      await requireVideoConsent(assessment.athlete_id);
      return assessment;
    },

    async acceptUpload(user, assessmentId, file) {
      try {
        const assessment = await accessibleAssessment(user, assessmentId, 'clip:upload');
        await requireVideoConsent(assessment.athlete_id);
        const { container, probe } = await checkVideoUpload(file);
        const manifest: ClipManifest = { ...plannedManifest(probe), source: probe };
        const storedName = `original.${container}`;
        const at = new Date().toISOString();
        let clipId = 0;
        try {
          await db.transaction(async (trx) => {
            // The athlete may have been erased (or the visit deleted) while the file was checked: then
            // nothing is kept (404). Holding the athlete's row, an erasure sent meanwhile waits for this
            // clip and erases it with the rest.
            const athlete = await lockedForUpdate(
              trx,
              trx('athletes').where({ id: assessment.athlete_id, clinic_id: user.clinicId }).whereNull('erased_at').select('id'),
            ).first();
            if (!athlete || !(await trx('assessments').where({ id: assessment.id }).first('id'))) throw new NotFoundError('Assessment');
            clipId = await repo.insert(trx, {
              clinic_id: user.clinicId,
              athlete_id: assessment.athlete_id,
              assessment_id: assessment.id,
              uploaded_by: user.id,
              original_name: cleanFileName(file.originalname),
              stored_name: storedName,
              size_bytes: file.size,
              container,
              status: 'queued',
              error: null,
              near_side: 'right',
              direction: 'left_to_right',
              capture_fps: null,
              ...clipFacts(manifest),
              created_at: at,
              updated_at: at,
            });
            await processing.enqueue(trx, EXTRACT_FRAMES, clipId, { clinicId: user.clinicId, athleteId: assessment.athlete_id });
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
            // Last inside the transaction: if storing fails, no row is committed.
            const keys = clipKeys(clipId);
            await store.putFile(keys.original(storedName), file.path);
            await putJson(store, keys.manifest, manifest);
          });
        } catch (err) {
          if (clipId) await store.removePrefix(clipKeys(clipId).prefix);
          throw err;
        }
        return view(clipId);
      } finally {
        await removeUpload(file.path);
      }
    },

    async list(user, assessmentId) {
      await accessibleAssessment(user, assessmentId, 'clip:read');
      return repo.listForAssessment(db, assessmentId);
    },

    async get(user, clipId) {
      await accessibleClip(user, clipId);
      return view(clipId);
    },

    async update(user, clipId, patch) {
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
      return view(clipId);
    },

    async remove(user, clipId) {
      const row = await accessibleClip(user, clipId, 'clip:delete');
      assertState(user, 'clip:delete', { uploadedBy: row.uploaded_by }, 'Clip');
      await removeClips([row]);
      await audit(db, { clinicId: user.clinicId, actorId: user.id, athleteId: row.athlete_id, action: 'clip.deleted', detail: { clipId } });
    },

    removeClips,

    async retry(user, clipId) {
      const row = await accessibleClip(user, clipId, 'clip:retry');
      if (row.status !== 'failed') throw new ConflictError('Only a clip whose processing failed can be retried.', 'not_failed');
      await db.transaction((trx) =>
        processing.enqueue(trx, EXTRACT_FRAMES, clipId, { clinicId: row.clinic_id, athleteId: row.athlete_id }),
      );
      return view(clipId);
    },

    async media(user, clipId, what, n = 0) {
      return clipMediaKey(processing, await accessibleClip(user, clipId, 'clip:read-media'), what, n);
    },

    manifest: (clipId) => readJson<ClipManifest>(store, clipKeys(clipId).manifest),
    manifestOf: readyManifests(store),
  };
}
