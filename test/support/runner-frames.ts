/**
 * The synthetic runner (scripts/demo-clip) as working frames in memory: JPEG bytes per frame and
 * the ground truth, for tests and benchmarks of the annotated-clip renderer. Invented motion with
 * known geometry, not a data set.
 */
import { createCanvas } from '@napi-rs/canvas';
import { buildGroundTruth, frameTimeS, modelForClip, type ClipSpec, type GroundTruth } from '../../scripts/demo-clip/ground-truth';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';
import { drawFrame } from '../../scripts/demo-clip/render';
import type { ClipPanelInput } from '../../server/render/annotated-clip-render';

export interface RunnerFrames {
  truth: GroundTruth;
  /** JPEG bytes of every frame. */
  jpegs: Buffer[];
}

/**
 * Draws every frame of the runner clip `spec` and encodes it as a JPEG (quality 85), as the
 * extraction step stores working frames. `noise` adds light sensor-like noise (benchmarks: so the
 * frames are not unrealistically easy to decode).
 */
export async function runnerFrames(spec: ClipSpec, opts: { noise?: boolean } = {}): Promise<RunnerFrames> {
  const truth = buildGroundTruth(spec);
  const { model, timing, layout, frameCount } = modelForClip(spec);
  const canvas = createCanvas(spec.width, spec.height);
  const ctx = canvas.getContext('2d');
  const jpegs: Buffer[] = [];
  let s = 2654435761;
  for (let i = 0; i < frameCount; i++) {
    drawFrame(ctx, model.pose(frameTimeS(i, spec, timing)), layout, spec, model.beltSpeedMps);
    if (opts.noise) {
      const img = ctx.getImageData(0, 0, spec.width, spec.height);
      for (let p = 0; p < img.data.length; p += 4) {
        s = (s * 1103515245 + 12345) >>> 0;
        const n = ((s >>> 16) % 7) - 3;
        for (let k = 0; k < 3; k++) img.data[p + k] = Math.max(0, Math.min(255, img.data[p + k]! + n));
      }
      ctx.putImageData(img, 0, 0);
    }
    jpegs.push(await canvas.encode('jpeg', 85));
  }
  return { truth, jpegs };
}

/** A renderer panel of the runner, marked on `landmarkFrames` from the truth (both sides, all events). */
export function runnerPanel(r: RunnerFrames, heading: string, landmarkFrames: 'all' | 'events' = 'all'): ClipPanelInput {
  const marks = marksFromTruth(r.truth, landmarkFrames);
  return {
    frameSize: { width: r.truth.width, height: r.truth.height },
    fps: r.truth.fps,
    readFrame: async (i) => r.jpegs[i]!,
    landmarks: marks.landmarks,
    events: marks.events,
    nearSide: r.truth.nearSide,
    direction: r.truth.facing === 'right' ? 'left_to_right' : 'right_to_left',
    heading,
  };
}
