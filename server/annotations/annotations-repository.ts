import type { Knex } from 'knex';
import type {
  AngleGauge,
  ClipAnnotations,
  FrameLandmarks,
  GaitEventMark,
  NotFollowedPoint,
  ScaleBar,
} from '../../src/contracts/annotations';
import { landmarkChanges, normalizeMarks, sameEvents, sameGauges, sameScale, type LandmarkRow, type MarkSet } from './annotation-changes';

const NO_MARKS: MarkSet = { landmarks: [], events: [], scale: null, gauges: [] };

interface GaugeRow {
  id: string;
  frame: number;
  ax: number;
  ay: number;
  vx: number;
  vy: number;
  bx: number;
  by: number;
}

async function insertLandmarks(trx: Knex, clipId: number, points: LandmarkRow[]): Promise<void> {
  if (points.length)
    await trx.batchInsert(
      'clip_landmarks',
      points.map((p) => ({ clip_id: clipId, ...p })),
      400,
    );
}

/** Frames of one marker whose entries one statement removes (well inside SQLite's parameter limit). */
export const NOT_FOLLOWED_DELETE_BATCH = 500;

/** Landmarks, gait events, the scale bar and the angle gauges of a clip. */
export const annotationsRepository = {
  async read(db: Knex, clipId: number): Promise<ClipAnnotations> {
    const clip = await db('clips as c')
      .leftJoin('users as u', 'u.id', 'c.annotated_by')
      .where('c.id', clipId)
      .first<{ annotation_revision: number; annotated_at: string | null; name: string | null }>(
        'c.annotation_revision',
        'c.annotated_at',
        'u.name',
      );
    const [points, events, scale, gaugeRows, notFollowed] = await Promise.all([
      db('clip_landmarks')
        .where({ clip_id: clipId })
        .orderBy(['frame', 'side'])
        .select<LandmarkRow[]>('frame', 'side', 'landmark', 'x', 'y', 'origin', 'confidence'),
      db('gait_events').where({ clip_id: clipId }).orderBy(['frame', 'side']).select<GaitEventMark[]>('frame', 'side', 'kind', 'origin'),
      db('scale_bars').where({ clip_id: clipId }).first(),
      db('angle_gauges')
        .where({ clip_id: clipId })
        .orderBy(['frame', 'id'])
        .select<GaugeRow[]>('id', 'frame', 'ax', 'ay', 'vx', 'vy', 'bx', 'by'),
      db('clip_not_followed')
        .where({ clip_id: clipId })
        .orderBy(['frame', 'side', 'landmark'])
        .select<NotFollowedPoint[]>('frame', 'side', 'landmark', 'reason'),
    ]);
    const byFrame = new Map<string, FrameLandmarks>();
    for (const p of points) {
      const key = `${p.frame}:${p.side}`;
      let entry = byFrame.get(key);
      if (!entry) {
        entry = { frame: p.frame, side: p.side, points: {} };
        byFrame.set(key, entry);
      }
      entry.points[p.landmark] = { x: p.x, y: p.y, origin: p.origin, ...(p.confidence === null ? {} : { confidence: p.confidence }) };
    }
    const bar: ScaleBar | null = scale
      ? { frame: scale.frame, a: { x: scale.ax, y: scale.ay }, b: { x: scale.bx, y: scale.by }, lengthM: scale.length_m }
      : null;
    const gauges: AngleGauge[] = gaugeRows.map((g) => ({
      id: g.id,
      frame: g.frame,
      a: { x: g.ax, y: g.ay },
      vertex: { x: g.vx, y: g.vy },
      b: { x: g.bx, y: g.by },
    }));
    return {
      clipId,
      revision: clip?.annotation_revision ?? 0,
      landmarks: [...byFrame.values()],
      events,
      scale: bar,
      gauges,
      notFollowed,
      updatedAt: clip?.annotated_at ?? null,
      updatedByName: clip?.name ?? null,
    };
  },

  /**
   * Turns the stored frames not followed `before` into `after` (inside the caller's transaction):
   * deletes the rows gone and inserts the rows new or with another reason.
   */
  async applyNotFollowed(
    trx: Knex,
    clipId: number,
    before: readonly NotFollowedPoint[],
    after: readonly NotFollowedPoint[],
  ): Promise<void> {
    const key = (p: NotFollowedPoint) => `${p.frame}:${p.side}:${p.landmark}`;
    const kept = new Map(after.map((p) => [key(p), p]));
    const had = new Map(before.map((p) => [key(p), p]));
    const gone = before.filter((p) => kept.get(key(p))?.reason !== p.reason);
    // Many rows per statement, by marker and a list of frames (the primary key's clip and frame lead, so
    // each is an index lookup on both databases): a follow run over a long clip can replace tens of
    // thousands of entries, and one statement each held the clip (and, on SQLite, every write) for seconds.
    const goneByMarker = new Map<string, { side: string; landmark: string; frames: number[] }>();
    for (const p of gone) {
      const marker = goneByMarker.get(`${p.side} ${p.landmark}`) ?? { side: p.side, landmark: p.landmark, frames: [] };
      marker.frames.push(p.frame);
      goneByMarker.set(`${p.side} ${p.landmark}`, marker);
    }
    for (const { side, landmark, frames } of goneByMarker.values())
      for (let i = 0; i < frames.length; i += NOT_FOLLOWED_DELETE_BATCH)
        await trx('clip_not_followed')
          .where({ clip_id: clipId, side, landmark })
          .whereIn('frame', frames.slice(i, i + NOT_FOLLOWED_DELETE_BATCH))
          .delete();
    const added = after.filter((p) => had.get(key(p))?.reason !== p.reason);
    if (added.length)
      await trx.batchInsert(
        'clip_not_followed',
        added.map((p) => ({ clip_id: clipId, frame: p.frame, side: p.side, landmark: p.landmark, reason: p.reason })),
        400,
      );
  },

  /** Replaces everything marked on the clip (inside the caller's transaction). */
  async replace(trx: Knex, clipId: number, input: Parameters<typeof normalizeMarks>[0]): Promise<void> {
    for (const table of ['clip_landmarks', 'gait_events', 'scale_bars', 'angle_gauges', 'clip_not_followed'])
      await trx(table).where({ clip_id: clipId }).delete();
    await annotationsRepository.applyChanges(trx, clipId, NO_MARKS, normalizeMarks(input));
  },

  /**
   * Turns the stored marks `before` into `after` (both as {@link normalizeMarks} shapes them),
   * inside the caller's transaction, writing only what differs: changed landmark rows, and the
   * events, scale bar or gauges only when they changed. `before` must be what is stored (the
   * caller checked the revision it was read at is still current).
   */
  async applyChanges(trx: Knex, clipId: number, before: MarkSet, after: MarkSet): Promise<void> {
    const lm = landmarkChanges(before.landmarks, after.landmarks);
    const rowCount = after.landmarks.reduce((n, l) => n + Object.keys(l.points).length, 0);
    if (lm.removed.length + lm.changed.length > Math.max(8, rowCount / 2)) {
      // Most rows change (a clear, an undo of many edits): one delete and a batch insert is cheaper.
      await trx('clip_landmarks').where({ clip_id: clipId }).delete();
      await insertLandmarks(trx, clipId, landmarkChanges([], after.landmarks).added);
    } else {
      for (const p of lm.removed) {
        await trx('clip_landmarks').where({ clip_id: clipId, frame: p.frame, side: p.side, landmark: p.landmark }).delete();
      }
      for (const p of lm.changed) {
        await trx('clip_landmarks')
          .where({ clip_id: clipId, frame: p.frame, side: p.side, landmark: p.landmark })
          .update({ x: p.x, y: p.y, origin: p.origin, confidence: p.confidence });
      }
      await insertLandmarks(trx, clipId, lm.added);
    }
    if (!sameEvents(before.events, after.events)) {
      await trx('gait_events').where({ clip_id: clipId }).delete();
      if (after.events.length)
        await trx.batchInsert(
          'gait_events',
          after.events.map((e) => ({ clip_id: clipId, ...e })),
          400,
        );
    }
    if (!sameScale(before.scale, after.scale)) {
      await trx('scale_bars').where({ clip_id: clipId }).delete();
      const s = after.scale;
      if (s)
        await trx('scale_bars').insert({
          clip_id: clipId,
          frame: s.frame,
          ax: s.a.x,
          ay: s.a.y,
          bx: s.b.x,
          by: s.b.y,
          length_m: s.lengthM,
        });
    }
    if (!sameGauges(before.gauges, after.gauges)) {
      await trx('angle_gauges').where({ clip_id: clipId }).delete();
      const gauges = after.gauges.map((g) => ({
        clip_id: clipId,
        id: g.id,
        frame: g.frame,
        ax: g.a.x,
        ay: g.a.y,
        vx: g.vertex.x,
        vy: g.vertex.y,
        bx: g.b.x,
        by: g.b.y,
      }));
      if (gauges.length) await trx.batchInsert('angle_gauges', gauges, 100);
    }
  },
};
