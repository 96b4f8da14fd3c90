/**
 * Grey frames and the small pixel helpers marker following needs: copying a square patch, the
 * sub-pixel peak of a score map, and the centroid of a high-contrast tape dot. Pure.
 */
import type { Point } from '../../src/kinematics/geometry';

/** One decoded frame as 8-bit luma, row-major, `width × height` bytes. */
export interface GrayFrame {
  width: number;
  height: number;
  data: Uint8Array;
}

/** Where a square patch of `size` px around a point lands, kept fully inside the frame. */
export function patchOrigin(frame: { width: number; height: number }, centre: Point, size: number): { x: number; y: number } {
  const half = Math.floor(size / 2);
  return {
    x: Math.max(0, Math.min(frame.width - size, Math.round(centre.x) - half)),
    y: Math.max(0, Math.min(frame.height - size, Math.round(centre.y) - half)),
  };
}

/** Copies the `size × size` patch at `origin` of `frame` into `out` (row-major). */
export function copyPatch(frame: GrayFrame, origin: { x: number; y: number }, size: number, out: Uint8Array): void {
  for (let r = 0; r < size; r++) {
    const start = (origin.y + r) * frame.width + origin.x;
    out.set(frame.data.subarray(start, start + size), r * size);
  }
}

/** Offset (−0.5…0.5) of a parabola's vertex through three equally spaced samples around the middle one. */
export function parabolaVertex(left: number, mid: number, right: number): number {
  const den = left - 2 * mid + right;
  if (den >= 0) return 0;
  return Math.max(-0.5, Math.min(0.5, (0.5 * (left - right)) / den));
}

/** The highest value of a `cols × rows` score map and its sub-pixel position. */
export function scorePeak(scores: Float32Array, cols: number, rows: number): { x: number; y: number; score: number } {
  let best = 0;
  for (let i = 1; i < cols * rows; i++) if (scores[i]! > scores[best]!) best = i;
  const bx = best % cols;
  const by = Math.floor(best / cols);
  const at = (x: number, y: number) => scores[y * cols + x]!;
  const dx = bx > 0 && bx < cols - 1 ? parabolaVertex(at(bx - 1, by), at(bx, by), at(bx + 1, by)) : 0;
  const dy = by > 0 && by < rows - 1 ? parabolaVertex(at(bx, by - 1), at(bx, by), at(bx, by + 1)) : 0;
  return { x: bx + dx, y: by + dy, score: scores[best]! };
}

/** A tape dot found around a point: its centre and how far it stands out from its surroundings (grey levels). */
export interface DotFit {
  x: number;
  y: number;
  contrast: number;
}

/**
 * Centre of the tape dot nearest `centre`: the pixels within `radius` that stand out from the
 * window's border (brighter when `polarity` is 1, darker when −1) by more than half the peak
 * contrast, weighted by how far they stand out. Returns null when nothing stands out.
 */
export function dotCentroid(frame: GrayFrame, centre: Point, radius: number, polarity: 1 | -1): DotFit | null {
  const r = Math.ceil(radius);
  const cx = Math.round(centre.x);
  const cy = Math.round(centre.y);
  if (cx - r < 0 || cy - r < 0 || cx + r >= frame.width || cy + r >= frame.height) return null;
  const border: number[] = [];
  for (let d = -r; d <= r; d++) {
    border.push(frame.data[(cy - r) * frame.width + cx + d]!, frame.data[(cy + r) * frame.width + cx + d]!);
    border.push(frame.data[(cy + d) * frame.width + cx - r]!, frame.data[(cy + d) * frame.width + cx + r]!);
  }
  border.sort((a, b) => a - b);
  const background = border[border.length >> 1]!;
  let peak = 0;
  const inner = Math.max(1, Math.round(r * 0.6));
  for (let y = -inner; y <= inner; y++)
    for (let x = -inner; x <= inner; x++) peak = Math.max(peak, polarity * (frame.data[(cy + y) * frame.width + cx + x]! - background));
  if (peak <= 0) return null;
  const threshold = peak / 2;
  let sw = 0;
  let sx = 0;
  let sy = 0;
  const r2 = (r + 0.5) * (r + 0.5);
  for (let y = -r; y <= r; y++)
    for (let x = -r; x <= r; x++) {
      if (x * x + y * y > r2) continue;
      const w = polarity * (frame.data[(cy + y) * frame.width + cx + x]! - background) - threshold;
      if (w <= 0) continue;
      sw += w;
      sx += w * x;
      sy += w * y;
    }
  if (sw === 0) return null;
  return { x: cx + sx / sw, y: cy + sy / sw, contrast: peak };
}
