import { ANNOTATED_CLIP_MAX_LONG_SIDE } from '../../src/contracts/annotated-clips';

/** Space between side-by-side panels, px of the video. */
export const PANEL_GAP = 8;

/**
 * The screen annotated clips are sized for: a 390×844 phone turned sideways for the player's full
 * screen, in CSS px. A clip is at most {@link ANNOTATED_CLIP_MAX_LONG_SIDE} wide, so a phone shows
 * it at 844 ÷ its width or less.
 */
export const PHONE_FULL_SCREEN = { width: 844, height: 390 } as const;

/** Heading size, CSS px, that the headings keep on {@link PHONE_FULL_SCREEN} (the smaller text is 0.8 of it). */
export const PHONE_HEADING_PX = 14;

/** Where the panels sit and how big the text is, px of the video. */
export interface ClipSizes {
  /** Width of each panel (its frame scaled to the common height). */
  widths: number[];
  panelHeight: number;
  /** Panels and gaps. */
  contentWidth: number;
  /** Heading font size; the other text is sized from it. */
  unit: number;
  /** CSS px per video px when the clip fills {@link PHONE_FULL_SCREEN}'s width (≤ 1). */
  phoneScale: number;
}

/**
 * Sizes of an annotated clip of frames `frameSizes` (one per panel): the panels at the first one's
 * height, shrunk together so that the video — panels, gaps and text bands — has its long side
 * ≤ {@link ANNOTATED_CLIP_MAX_LONG_SIDE}. Text follows the output size, not the frame: about 2.8 %
 * of the panel height and at least what keeps headings {@link PHONE_HEADING_PX} CSS px when a phone
 * shows the clip full screen; so side by side (two frames in the width of one) the text is as big
 * in the video as a single clip's, not half. Pure.
 */
export function clipSizes(frameSizes: readonly { width: number; height: number }[]): ClipSizes {
  const gaps = PANEL_GAP * (frameSizes.length - 1);
  const baseHeight = frameSizes[0]!.height;
  const naturalWidths = frameSizes.map((f) => (f.width * baseHeight) / f.height);
  const naturalWidth = naturalWidths.reduce((a, b) => a + b, 0);
  const textUnit = (contentWidth: number, panelHeight: number) => {
    const phoneScale = Math.min(1, PHONE_FULL_SCREEN.width / contentWidth);
    return Math.max(12, Math.round(Math.min(contentWidth, panelHeight) * 0.028), Math.ceil(PHONE_HEADING_PX / phoneScale));
  };
  // The text bands take about 10 units (heading, caption lines, speed and caution lines).
  const bandsEstimate = textUnit(Math.min(naturalWidth + gaps, ANNOTATED_CLIP_MAX_LONG_SIDE), baseHeight) * 10;
  const fit = Math.min(
    1,
    (ANNOTATED_CLIP_MAX_LONG_SIDE - gaps) / naturalWidth,
    ANNOTATED_CLIP_MAX_LONG_SIDE / (baseHeight + bandsEstimate),
  );
  const panelHeight = Math.round(baseHeight * fit);
  const widths = naturalWidths.map((w) => Math.floor(w * fit));
  const contentWidth = widths.reduce((a, b) => a + b, 0) + gaps;
  return {
    widths,
    panelHeight,
    contentWidth,
    unit: textUnit(contentWidth, panelHeight),
    phoneScale: Math.min(1, PHONE_FULL_SCREEN.width / contentWidth),
  };
}
