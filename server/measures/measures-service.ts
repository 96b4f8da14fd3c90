import type { Knex } from 'knex';
import type { ClipAnnotations } from '../../src/contracts/annotations';
import type { SessionUser } from '../../src/contracts/api';
import type { ClipMeasures } from '../../src/contracts/measures';
import { computeClipMeasures, KINEMATICS_VERSION } from '../../src/kinematics';
import type { Db } from '../db/knex';
import { ConflictError } from '../errors';
import type { ClipRow } from '../clips/clips-repository';
import type { ClipsService } from '../clips/clips-service';
import { annotationsRepository } from '../annotations/annotations-repository';
import { clinicBands } from './reference-bands';

/**
 * Measures of clips, computed with `src/kinematics` when first read after the marks change (a save
 * does not compute them) and kept as a snapshot of that annotation revision until the next change.
 */
export interface MeasuresService {
  forClip(user: SessionUser, clipId: number): Promise<ClipMeasures>;
  forAssessment(user: SessionUser, assessmentId: number): Promise<ClipMeasures[]>;
  /** Measures of an assessment's ready clips, without an access check (callers check). */
  ofAssessment(assessmentId: number): Promise<ClipMeasures[]>;
}

export function measuresService({ db, clips }: { db: Db; clips: ClipsService }): MeasuresService {
  /** Computes a clip's measures from its annotations (pure kinematics; no writes). */
  async function compute(trx: Knex, clip: ClipRow, annotations: ClipAnnotations): Promise<ClipMeasures> {
    const assessment = await trx('assessments')
      .where({ id: clip.assessment_id })
      .first<{ surface: string; speed_mps: number | null; clinic_id: number }>('surface', 'speed_mps', 'clinic_id');
    // The manifest is the one source of the clip's media facts (frame size, rate, timestamps).
    const manifest = await clips.manifestOf(clip);
    if (!manifest) throw new ConflictError('This clip is not ready yet.', 'clip_not_ready');
    const bands = await clinicBands(trx, clip.clinic_id);
    // A slow-motion file plays slower than it was filmed: with a capture rate set, its own
    // timestamps are not real time, so timing uses the capture rate alone.
    const slowMotion = clip.capture_fps !== null;
    return computeClipMeasures({
      clipId: clip.id,
      annotations: { landmarks: annotations.landmarks, events: annotations.events, scale: annotations.scale },
      frameSize: { width: manifest.width, height: manifest.height },
      fps: clip.capture_fps ?? manifest.fps,
      timestampsMs: slowMotion ? undefined : manifest.timestampsMs,
      direction: clip.direction,
      surface: (assessment?.surface ?? 'treadmill') as 'treadmill',
      beltSpeedMps: assessment?.surface === 'treadmill' ? (assessment.speed_mps ?? null) : null,
      bands,
      frameCount: manifest.frameCount,
    });
  }

  async function store_(trx: Knex, clip: ClipRow, revision: number, measures: ClipMeasures): Promise<void> {
    await trx('measure_snapshots')
      .insert({
        clip_id: clip.id,
        assessment_id: clip.assessment_id,
        annotation_revision: revision,
        kinematics_version: KINEMATICS_VERSION,
        measures: JSON.stringify(measures),
        computed_at: new Date().toISOString(),
      })
      .onConflict('clip_id')
      .merge();
  }

  /** The snapshot when it matches the current revision and kinematics version, else a fresh one. */
  async function forClipRow(clip: ClipRow): Promise<ClipMeasures> {
    const snapshot = await db('measure_snapshots')
      .where({ clip_id: clip.id })
      .first<{ annotation_revision: number; kinematics_version: string; measures: string } | undefined>();
    const current = await db('clips').where({ id: clip.id }).first<{ annotation_revision: number }>('annotation_revision');
    if (snapshot && snapshot.annotation_revision === current?.annotation_revision && snapshot.kinematics_version === KINEMATICS_VERSION) {
      return JSON.parse(snapshot.measures) as ClipMeasures;
    }
    const annotations = await annotationsRepository.read(db, clip.id);
    const measures = await compute(db, clip, annotations);
    await store_(db, clip, annotations.revision, measures);
    return measures;
  }

  /** Measures of an assessment's ready clips, without an access check (callers check). */
  async function ofAssessment(assessmentId: number): Promise<ClipMeasures[]> {
    const rows = await db<ClipRow>('clips').where({ assessment_id: assessmentId, status: 'ready' }).orderBy('id');
    const out: ClipMeasures[] = [];
    for (const row of rows) out.push(await forClipRow(row));
    return out;
  }

  return {
    async forClip(user: SessionUser, clipId: number): Promise<ClipMeasures> {
      const clip = await clips.accessibleClip(user, clipId, 'measure:read');
      if (clip.status !== 'ready') throw new ConflictError('This clip is not ready yet.', 'clip_not_ready');
      return forClipRow(clip);
    },

    async forAssessment(user: SessionUser, assessmentId: number): Promise<ClipMeasures[]> {
      await clips.accessibleAssessment(user, assessmentId, 'measure:read');
      return ofAssessment(assessmentId);
    },

    ofAssessment,
  };
}
