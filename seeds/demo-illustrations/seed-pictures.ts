/**
 * Seeds the demo library's demonstration pictures: each key position of `poses.ts` drawn with
 * @napi-rs/canvas (the canvas the server's stills use), then processed like any uploaded picture
 * (jimp: JPEG of long side ≤ 1600 and a 400 px thumbnail) and stored under the exercise.
 */
import { createCanvas } from '@napi-rs/canvas';
import type { Knex } from 'knex';
import { demoPictureKey } from '../../server/storage/media-keys';
import { processPicture } from '../../server/pictures/picture-processing';
import { localMediaStore } from '../../server/storage/local-media-store';
import { drawPose, frameOf, sizeFor } from './figure';
import { DEMO_ILLUSTRATIONS, type KeyPosition } from './poses';

/**
 * The key positions of one exercise as PNGs, 1000 px wide, all at one scale and size (the figure
 * fills the picture and does not jump as the athlete swipes).
 */
export function drawKeyPositions(positions: readonly KeyPosition[]): Buffer[] {
  const frame = frameOf(positions.map((p) => p.pose));
  const { width, height } = sizeFor(frame);
  return positions.map((p) => {
    const canvas = createCanvas(width, height);
    drawPose(canvas.getContext('2d') as unknown as CanvasRenderingContext2D, p.pose, width, height, frame);
    return canvas.toBuffer('image/png');
  });
}

/** Draws, processes and stores the pictures of every demo exercise of the clinic that has none yet. */
export async function seedDemoPictures(knex: Knex, clinicId: number, uploadsDir: string, log: (m: string) => void): Promise<number> {
  const store = localMediaStore(uploadsDir);
  const exercises = await knex('exercises').where({ clinic_id: clinicId }).select<{ id: number; name: string }[]>('id', 'name');
  let count = 0;
  log('drawing the demo exercises\u2019 pictures…');
  for (const exercise of exercises) {
    const positions = DEMO_ILLUSTRATIONS[exercise.name];
    if (!positions || (await knex('demo_pictures').where({ exercise_id: exercise.id }).first('id'))) continue;
    const drawings = drawKeyPositions(positions);
    for (const [position, key] of positions.entries()) {
      const processed = await processPicture(drawings[position]!);
      const [row] = await knex('demo_pictures')
        .insert({
          clinic_id: clinicId,
          exercise_id: exercise.id,
          position,
          caption: key.caption,
          width: processed.full.width,
          height: processed.full.height,
          thumb_width: processed.thumb.width,
          thumb_height: processed.thumb.height,
          created_by: null,
          created_at: new Date().toISOString(),
        })
        .returning('id');
      const id = (row as { id: number }).id;
      await store.put(demoPictureKey(exercise.id, id, 'full'), processed.full.bytes);
      await store.put(demoPictureKey(exercise.id, id, 'thumb'), processed.thumb.bytes);
      count++;
    }
  }
  log(`${count} demo exercise pictures stored`);
  return count;
}
