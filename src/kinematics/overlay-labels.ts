/**
 * Keeps the overlay's angle labels apart: when labels are sized in view pixels (a frame shown
 * small, as on a phone) they grow relative to the body and a knee label can land on the ankle's.
 * Text width is estimated from the font size (no text measuring on a Canvas2DLike), generously.
 * Pure.
 */

/** A label's anchor and alignment, as the overlay places it (vertically centred). */
export interface PlacedLabel {
  text: string;
  x: number;
  y: number;
  align: 'left' | 'right' | 'center';
}

/** Estimated box of a label in frame pixels (with its halo): a glyph averages ≤ 0.6 em in Source Sans 3 semibold. */
export function labelBox(l: PlacedLabel, fontPx: number): { left: number; right: number; top: number; bottom: number } {
  const w = l.text.length * fontPx * 0.6 + fontPx * 0.5;
  const h = fontPx * 1.3;
  const left = l.align === 'left' ? l.x : l.align === 'right' ? l.x - w : l.x - w / 2;
  return { left, right: left + w, top: l.y - h / 2, bottom: l.y + h / 2 };
}

const overlap = (a: ReturnType<typeof labelBox>, b: ReturnType<typeof labelBox>) =>
  a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;

/**
 * Moves labels down, in order, until none overlaps an earlier one (each only ever moves down, so
 * this ends). Returns new label objects; the first label never moves.
 */
export function separateLabels<T extends PlacedLabel>(labels: readonly T[], fontPx: number): T[] {
  const placed: T[] = [];
  for (const l of labels) {
    let cur = { ...l };
    for (let guard = 0; guard <= labels.length; guard++) {
      const box = labelBox(cur, fontPx);
      const hit = placed.map((p) => labelBox(p, fontPx)).find((b) => overlap(box, b));
      if (!hit) break;
      cur = { ...cur, y: hit.bottom + (box.bottom - box.top) / 2 + 1 };
    }
    placed.push(cur);
  }
  return placed;
}
