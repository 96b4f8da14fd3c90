import type { FrameLandmarks } from '../../../contracts/annotations';
import type { Direction, Side } from '../../../contracts/assessment';
import { drawGhostSkeleton, drawOverlay, overlaySizes } from '../../../kinematics';

/** One visit's frame to draw: its image, size, marks and how the clip was filmed. */
export interface CompareFrame {
  bitmap: CanvasImageSource;
  frameSize: { width: number; height: number };
  landmarks: FrameLandmarks[];
  nearSide: Side;
  direction: Direction;
}

/**
 * View pixels per frame pixel of a canvas that shows `frameWidth` frame pixels across its CSS
 * width; undefined before the canvas is laid out (then sizes follow the frame).
 */
export function viewScaleOf(cssWidth: number, frameWidth: number): number | undefined {
  return cssWidth > 0 && frameWidth > 0 ? cssWidth / frameWidth : undefined;
}

/**
 * Draws a frame with its skeleton and angle labels sized in view pixels (readable however small
 * the frame is shown); with `ghost`, the other visit's skeleton (already aligned) dashed and
 * lighter underneath. Records the label size in CSS pixels as `data-label-px` on the canvas.
 */
export function drawCompareFrame(canvas: HTMLCanvasElement, shown: CompareFrame | null, ghost: FrameLandmarks[] | null): void {
  const ctx = canvas.getContext('2d');
  if (!ctx) return;
  if (!shown) {
    ctx.clearRect(0, 0, canvas.width, canvas.height);
    return;
  }
  const { frameSize } = shown;
  canvas.width = frameSize.width;
  canvas.height = frameSize.height;
  const viewScale = viewScaleOf(canvas.getBoundingClientRect().width, frameSize.width);
  ctx.drawImage(shown.bitmap, 0, 0, frameSize.width, frameSize.height);
  if (ghost) drawGhostSkeleton(ctx, { frameSize, landmarks: ghost, viewScale });
  drawOverlay(ctx, {
    frameSize,
    landmarks: shown.landmarks,
    nearSide: shown.nearSide,
    direction: shown.direction,
    showAngles: true,
    viewScale,
  });
  canvas.dataset['labelPx'] = (overlaySizes(frameSize, viewScale).fontPx * (viewScale ?? 1)).toFixed(1);
}
