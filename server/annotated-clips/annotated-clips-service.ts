import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import {
  ANNOTATED_CLIP_MAX_SOURCE_FRAMES,
  type AnnotatedClip,
  type AnnotatedClipCreate,
  type SideBySideClipCreate,
} from '../../src/contracts/annotated-clips';
import type { ClipAnnotations } from '../../src/contracts/annotations';
import { frameRangeProblem, pairInitialContacts, sideBySideSteps } from '../../src/kinematics';
import type { Db } from '../db/knex';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors';
import { audit } from '../audit/audit-log';
import type { Action } from '../policy/access-table';
import { accessibleAthlete } from '../policy/athlete-resources';
import { listGrant, throughSelfGrant } from '../policy/enforce';
import type { Processing } from '../processing/processing';
import { renderOnce } from '../processing/render-once';
import type { MediaStore } from '../storage/media-store';
import type { Mailer } from '../mail/mailer';
import { accessibleShared, deleteShared, setPublication } from '../sharing/shared-items';
import type { ClipManifest } from '../media/manifest';
import { clipKeys } from '../storage/media-keys';
import { readJson } from '../storage/stored-objects';
import type { ClipRow } from '../clips/clips-repository';
import type { ClipsService } from '../clips/clips-service';
import { annotationsRepository } from '../annotations/annotations-repository';
import { displayDate } from '../stills/stills-service';
import { ASSESSMENT_KIND_LABELS, type AssessmentKind } from '../../src/contracts/assessment';
import {
  BASELINE_CLIP_DELETED,
  annotatedClipsRepository as repo,
  lostBaseline,
  type AnnotatedClipRow,
  type StoredClipPanel,
} from './annotated-clips-repository';
import { RENDER_ANNOTATED_CLIP, removeAnnotatedVideo, renderAnnotatedClipKind } from './render-annotated-clip-kind';

export interface AnnotatedClipsDeps {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
}

/** What the annotated clips offer their routes. */
export interface AnnotatedClipsService {
  create(user: SessionUser, clipId: number, body: AnnotatedClipCreate): Promise<AnnotatedClip>;
  createSideBySide(user: SessionUser, athleteId: number, body: SideBySideClipCreate): Promise<AnnotatedClip>;
  list(user: SessionUser, athleteId: number): Promise<AnnotatedClip[]>;
  get(user: SessionUser, id: number): Promise<AnnotatedClip>;
  setPublished(user: SessionUser, id: number, publish: boolean): Promise<AnnotatedClip>;
  remove(user: SessionUser, id: number): Promise<void>;
  /** Media key of a ready clip's MP4; logs an athlete's view in the audit log when `logView`. */
  videoKey(user: SessionUser, id: number, logView: boolean): Promise<string>;
}

/**
 * The marks one panel needs, frozen now: landmarks of the frames `from`…`to` and of the nearest
 * frame carrying each side before and after (so the ends interpolate as in the review), events
 * and gauges of the range. Pure.
 */
export function freezeMarks(
  annotations: Pick<ClipAnnotations, 'landmarks' | 'events' | 'gauges'>,
  from: number,
  to: number,
): Pick<StoredClipPanel, 'landmarks' | 'events' | 'gauges'> {
  const inside = (f: number) => f >= from && f <= to;
  const keep = new Set<string>();
  for (const side of ['left', 'right'] as const) {
    const frames = annotations.landmarks.filter((l) => l.side === side).map((l) => l.frame);
    const before = Math.max(-1, ...frames.filter((f) => f < from));
    const after = Math.min(Number.POSITIVE_INFINITY, ...frames.filter((f) => f > to));
    for (const f of [before, after]) if (Number.isFinite(f) && f >= 0) keep.add(`${side}:${f}`);
  }
  return {
    landmarks: annotations.landmarks.filter((l) => inside(l.frame) || keep.has(`${l.side}:${l.frame}`)),
    events: annotations.events.filter((e) => inside(e.frame)),
    gauges: (annotations.gauges ?? []).filter((g) => inside(g.frame)),
  };
}

/** Annotated clips: make (marks frozen, rendered as a processed item), list, publish, delete, serve. */
export function annotatedClipsService(d: AnnotatedClipsDeps): AnnotatedClipsService {
  const { db, processing } = d;
  processing.register(renderAnnotatedClipKind(d));
  const now = () => d.clock().toISOString();

  const accessible = (user: SessionUser, id: number, action: Action = 'annotated-clip:read') =>
    accessibleShared<AnnotatedClipRow>(db, 'annotated_clip', user, id, action, (row) => !lostBaseline(row));

  async function view(id: number): Promise<AnnotatedClip> {
    const [clip] = await repo.view(db, { id }, { publishedOnly: false });
    if (!clip) throw new NotFoundError('Annotated clip');
    return clip;
  }

  /** A ready clip's media facts and its panel without frames and marks yet. */
  async function clipFacts(clip: ClipRow) {
    if (clip.status !== 'ready')
      throw new ConflictError('This clip is not ready yet: wait until its frames are extracted.', 'clip_not_ready');
    const manifest =
      clip.frame_count && clip.fps && clip.width && clip.height ? null : await readJson<ClipManifest>(d.store, clipKeys(clip.id).manifest);
    const assessment = await db('assessments')
      .where({ id: clip.assessment_id })
      .first<{ kind: AssessmentKind; date: string }>('kind', 'date');
    const label = `${ASSESSMENT_KIND_LABELS[assessment.kind]} · ${displayDate(assessment.date)}`;
    return {
      frameCount: clip.frame_count ?? manifest?.frameCount ?? 0,
      // Real time is the capture rate (a phone's slow-motion clip plays back slower than it was shot).
      fps: clip.capture_fps ?? clip.fps ?? manifest?.fps ?? 30,
      frameSize: { width: manifest?.width ?? clip.width ?? 1, height: manifest?.height ?? clip.height ?? 1 },
      label,
      kind: assessment.kind,
      annotations: await annotationsRepository.read(db, clip.id),
    };
  }

  function rangeError(from: number, to: number, frameCount: number): void {
    const problem = frameRangeProblem(from, to, frameCount, ANNOTATED_CLIP_MAX_SOURCE_FRAMES);
    if (problem) {
      const field = to < from || to >= frameCount || to - from + 1 > ANNOTATED_CLIP_MAX_SOURCE_FRAMES ? 'toFrame' : 'fromFrame';
      throw new ValidationError(problem, [{ path: [field], message: problem }]);
    }
  }

  /**
   * Makes the annotated clip and queues its render. Identical: the same clip(s), frames with the same marks frozen
   * (`panels`), speed, caption and angles, a new one not yet rendered; asked for again then (a double click, a
   * retry) it is that one, not a second render.
   */
  async function insertAndQueue(user: SessionUser, row: Omit<AnnotatedClipRow, 'id'>): Promise<number> {
    const { id, made } = await renderOnce(db, processing, {
      table: 'annotated_clips',
      lock: (trx) => trx('clips').where({ id: row.clip_id }).select('id'),
      same: {
        clinic_id: row.clinic_id,
        clip_id: row.clip_id,
        other_clip_id: row.other_clip_id,
        kind: row.kind,
        panels: row.panels,
        factor: row.factor,
        caption: row.caption,
        show_angles: row.show_angles,
        render_version: 1,
      },
      kind: RENDER_ANNOTATED_CLIP,
      scope: { clinicId: user.clinicId, athleteId: row.athlete_id },
      insert: (trx) => repo.insert(trx, row),
    });
    if (made)
      await audit(db, {
        clinicId: user.clinicId,
        actorId: user.id,
        athleteId: row.athlete_id,
        action: 'annotated_clip.created',
        detail: { annotatedClipId: id, clipId: row.clip_id, otherClipId: row.other_clip_id },
      });
    return id;
  }

  function baseRow(user: SessionUser, clip: ClipRow, body: { factor: number; caption: string; showAngles: boolean }) {
    const at = now();
    return {
      clinic_id: user.clinicId,
      athlete_id: clip.athlete_id,
      assessment_id: clip.assessment_id,
      clip_id: clip.id,
      factor: body.factor,
      caption: body.caption.trim(),
      show_angles: body.showAngles,
      status: 'rendering' as const,
      error: null,
      width: null,
      height: null,
      frame_count: null,
      fps: null,
      duration_s: null,
      repeat: null,
      note: null,
      render_version: 1,
      published_at: null,
      published_by: null,
      created_by: user.id,
      created_at: at,
      updated_at: at,
    };
  }

  return {
    async create(user, clipId, body) {
      const clip = await d.clips.accessibleClip(user, clipId, 'annotated-clip:create');
      const facts = await clipFacts(clip);
      rangeError(body.fromFrame, body.toFrame, facts.frameCount);
      const panel: StoredClipPanel = {
        clipId: clip.id,
        assessmentId: clip.assessment_id,
        label: facts.label,
        heading: facts.label,
        fromFrame: body.fromFrame,
        toFrame: body.toFrame,
        fps: facts.fps,
        frameSize: facts.frameSize,
        nearSide: clip.near_side,
        direction: clip.direction,
        ...freezeMarks(facts.annotations, body.fromFrame, body.toFrame),
      };
      const steps: number[][] = [];
      for (let f = body.fromFrame; f <= body.toFrame; f++) steps.push([f]);
      const id = await insertAndQueue(user, {
        ...baseRow(user, clip, body),
        other_clip_id: null,
        kind: 'single',
        panels: JSON.stringify({ panels: [panel], steps }),
      });
      return view(id);
    },

    async createSideBySide(user, athleteId, body) {
      await accessibleAthlete(db, user, athleteId, 'annotated-clip:create');
      const clipOf = (clipId: number, field: string) =>
        d.clips
          .accessibleClip(user, clipId, 'annotated-clip:create')
          .then((c) => {
            if (c.athlete_id !== athleteId) throw new NotFoundError('Clip');
            return c;
          })
          .catch((err: unknown) => {
            if (err instanceof NotFoundError)
              throw new ValidationError('That clip was not found for this athlete.', [{ path: [field], message: 'Clip not found.' }]);
            throw err;
          });
      const baseline = await clipOf(body.baselineClipId, 'baselineClipId');
      const retest = await clipOf(body.retestClipId, 'retestClipId');
      if (baseline.id === retest.id)
        throw new ValidationError('Choose two different clips: a Baseline and a Re-test.', [
          { path: ['retestClipId'], message: 'Choose the other visit’s clip.' },
        ]);
      const b = await clipFacts(baseline);
      const r = await clipFacts(retest);
      const pairs = pairInitialContacts(b.annotations.events, r.annotations.events);
      if (pairs.length === 0)
        throw new AppError(
          422,
          'no_initial_contacts',
          'Side by side needs initial contacts of the same side marked on both clips, to line the steps up. Mark them in the review first.',
        );
      const from = body.fromFrame ?? pairs[0]![0];
      const to = body.toFrame ?? Math.min(pairs[pairs.length - 1]![0], from + ANNOTATED_CLIP_MAX_SOURCE_FRAMES - 1);
      // One pair only: a stride's worth after it, as the review's default.
      const end = body.toFrame === undefined && to === from ? Math.min(b.frameCount - 1, from + Math.round(0.7 * b.fps)) : to;
      rangeError(from, end, b.frameCount);
      const steps = sideBySideSteps(from, end, pairs, r.fps / b.fps, r.frameCount);
      const rFrom = steps[0]![1];
      const rTo = steps[steps.length - 1]![1];
      const panel = (clip: ClipRow, facts: typeof b, fromFrame: number, toFrame: number): StoredClipPanel => ({
        clipId: clip.id,
        assessmentId: clip.assessment_id,
        label: facts.label,
        heading: facts.label,
        fromFrame,
        toFrame,
        fps: facts.fps,
        frameSize: facts.frameSize,
        nearSide: clip.near_side,
        direction: clip.direction,
        ...freezeMarks(facts.annotations, fromFrame, toFrame),
      });
      const id = await insertAndQueue(user, {
        ...baseRow(user, retest, body),
        other_clip_id: baseline.id,
        kind: 'side_by_side',
        // Baseline on the left, Re-test on the right (as the comparison and the stills).
        panels: JSON.stringify({ panels: [panel(baseline, b, from, end), panel(retest, r, rFrom, rTo)], steps }),
      });
      return view(id);
    },

    async list(user, athleteId) {
      await accessibleAthlete(db, user, athleteId, 'annotated-clip:list');
      const publishedOnly = listGrant(user, 'annotated-clip:list').when.includes('published');
      return repo.view(db, { athlete_id: athleteId, clinic_id: user.clinicId }, { publishedOnly });
    },

    async get(user, id) {
      await accessible(user, id);
      return view(id);
    },

    async setPublished(user, id, publish) {
      const row = await accessible(user, id, 'annotated-clip:publish');
      if (publish && lostBaseline(row)) throw new ConflictError(BASELINE_CLIP_DELETED, 'clip_deleted');
      if (publish && row.status !== 'ready')
        throw new ConflictError(
          row.status === 'failed'
            ? 'This clip could not be rendered; delete it and make it again.'
            : 'This clip is still rendering: publish it when it is ready.',
          'annotated_clip_not_ready',
        );
      await setPublication(d, 'annotated_clip', user, row, publish);
      return view(id);
    },

    async remove(user, id) {
      const row = await accessible(user, id, 'annotated-clip:delete');
      await deleteShared(d, 'annotated_clip', user, row, () => removeAnnotatedVideo(d.store, row, row.render_version));
    },

    async videoKey(user, id, logView) {
      const row = await accessible(user, id);
      if (row.status !== 'ready' || lostBaseline(row)) throw new NotFoundError('Annotated clip video');
      const key = clipKeys(row.clip_id).annotated(id, row.render_version);
      if (!(await d.store.stat(key))) throw new NotFoundError('Annotated clip video');
      if (logView && throughSelfGrant(user, 'annotated-clip:read'))
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'annotated_clip.viewed',
          detail: { annotatedClipId: id },
        });
      return key;
    },
  };
}
