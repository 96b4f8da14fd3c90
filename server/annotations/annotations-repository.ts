import type { Knex } from 'knex';
import type {
  AngleGauge,
  ClipAnnotations,
  FrameLandmarks,
  GaitEventMark,
  LandmarkName,
  LandmarkOrigin,
  ScaleBar,
} from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';
import type { AnnotationsInput } from './annotations-schemas';

interface LandmarkRow {
  frame: number;
  side: Side;
  landmark: LandmarkName;
  x: number;
  y: number;
  origin: LandmarkOrigin;
  confidence: number | null;
}

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
    const [points, events, scale, gaugeRows] = await Promise.all([
      db('clip_landmarks')
        .where({ clip_id: clipId })
        .orderBy(['frame', 'side'])
        .select<LandmarkRow[]>('frame', 'side', 'landmark', 'x', 'y', 'origin', 'confidence'),
      db('gait_events').where({ clip_id: clipId }).orderBy('frame').select<GaitEventMark[]>('frame', 'side', 'kind'),
      db('scale_bars').where({ clip_id: clipId }).first(),
      db('angle_gauges')
        .where({ clip_id: clipId })
        .orderBy(['frame', 'id'])
        .select<GaugeRow[]>('id', 'frame', 'ax', 'ay', 'vx', 'vy', 'bx', 'by'),
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
      updatedAt: clip?.annotated_at ?? null,
      updatedByName: clip?.name ?? null,
    };
  },

  /** Replaces everything marked on the clip (inside the caller's transaction). */
  async replace(
    trx: Knex,
    clipId: number,
    input: Omit<AnnotationsInput, 'gauges'> & { gauges?: AnnotationsInput['gauges'] },
  ): Promise<void> {
    await trx('clip_landmarks').where({ clip_id: clipId }).delete();
    await trx('gait_events').where({ clip_id: clipId }).delete();
    await trx('scale_bars').where({ clip_id: clipId }).delete();
    await trx('angle_gauges').where({ clip_id: clipId }).delete();
    const rows = input.landmarks.flatMap((l) =>
      Object.entries(l.points).map(([landmark, p]) => ({
        clip_id: clipId,
        frame: l.frame,
        side: l.side,
        landmark,
        x: p!.x,
        y: p!.y,
        origin: p!.origin ?? (l.source === 'tracked' ? 'followed' : 'placed'),
        confidence: p!.confidence ?? null,
      })),
    );
    if (rows.length) await trx.batchInsert('clip_landmarks', rows, 400);
    if (input.events.length)
      await trx.batchInsert(
        'gait_events',
        input.events.map((e) => ({ clip_id: clipId, ...e })),
        400,
      );
    if (input.scale) {
      const s = input.scale;
      await trx('scale_bars').insert({ clip_id: clipId, frame: s.frame, ax: s.a.x, ay: s.a.y, bx: s.b.x, by: s.b.y, length_m: s.lengthM });
    }
    const gauges = (input.gauges ?? []).map((g) => ({
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
  },
};
