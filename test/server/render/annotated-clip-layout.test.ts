/**
 * Sizes of annotated clips (pure). References: the 1,280 px long-side limit of the issue, and a
 * 390×844 phone turned sideways for full screen (844×390 CSS px): the scale at which it shows a
 * video is recomputed here by hand ([calc]); 14 px headings and 11 px smaller text are sizes
 * commonly used for reading on phones (common practice).
 */
import { describe, expect, it } from 'vitest';
import { PANEL_GAP, clipSizes } from '../../../server/render/annotated-clip-layout';

const HD = { width: 1280, height: 720 };

describe('clipSizes', () => {
  it('fits two 1280×720 frames side by side, with the gap, into 1280 px at one height', () => {
    const s = clipSizes([HD, HD]);
    expect(s.widths[0]).toBe(s.widths[1]);
    expect(s.contentWidth).toBe(s.widths[0]! + s.widths[1]! + PANEL_GAP);
    expect(s.contentWidth).toBeLessThanOrEqual(1280);
    // Each panel keeps 16:9 within a pixel.
    expect(Math.abs(s.widths[0]! / s.panelHeight - 16 / 9)).toBeLessThan(0.01);
  });

  it('sizes side-by-side text for a phone: headings ≥ 14 CSS px and smaller text ≥ 11 px at full screen width', () => {
    const s = clipSizes([HD, HD]);
    const shown = 844 / s.contentWidth; // the phone's width binds for a video this wide
    expect(s.unit * shown).toBeGreaterThanOrEqual(14);
    expect(Math.round(s.unit * 0.8) * shown).toBeGreaterThanOrEqual(11);
    // Not sized from the half-size frame: as large in the video as a single 1280×720 clip's text.
    expect(s.unit).toBeGreaterThanOrEqual(clipSizes([HD]).unit);
  });

  it('leaves a single 1280×720 frame at its own size', () => {
    const s = clipSizes([HD]);
    expect(s).toMatchObject({ widths: [1280], panelHeight: 720, contentWidth: 1280 });
  });

  it('scales a Re-test of another aspect to the Baseline height', () => {
    const s = clipSizes([HD, { width: 960, height: 720 }]);
    expect(Math.abs(s.widths[1]! / s.panelHeight - 4 / 3)).toBeLessThan(0.01);
    expect(s.contentWidth).toBeLessThanOrEqual(1280);
  });
});
