import { describe, expect, it } from 'vitest';
import { clipFactsText, clipLengthText, clipTitle, frameOfText, frameStepTime } from './clip-logic';

describe('clip-logic', () => {
  it('says how long a range plays: 60 frames of 60 fps at 1/4 → 4.0 s ([calc] 60 ÷ (60 × ¼))', () => {
    expect(clipLengthText(60, 60, 0.25)).toBe('60 frames → 4.0 s at 1/4 speed');
    expect(clipLengthText(1, 30, 1)).toBe('1 frame → 0.0 s at real time');
    expect(clipLengthText(0, 30, 1)).toBe('');
  });

  it('steps one source frame (repeat video frames), landing mid-frame, within the video', () => {
    // 30 fps video, 4 copies per source frame: a source frame lasts 4/30 s; 8 s → 60 source frames.
    const per = 4 / 30;
    expect(frameStepTime(0, 30, 4, 8, 1)).toBeCloseTo(1.5 * per, 9);
    expect(frameStepTime(1.5 * per, 30, 4, 8, 1)).toBeCloseTo(2.5 * per, 9);
    expect(frameStepTime(1.5 * per, 30, 4, 8, -1)).toBeCloseTo(0.5 * per, 9);
    expect(frameStepTime(0, 30, 4, 8, -1)).toBeCloseTo(0.5 * per, 9); // stays on the first
    expect(frameStepTime(8, 30, 4, 8, 1)).toBeCloseTo(59.5 * per, 9); // stays on the last
    expect(frameOfText(2.5 * per, 30, 4, 8)).toBe('Frame 3 of 60');
  });

  it('titles a clip by its caption, else by what it shows', () => {
    const panels = [
      { clipId: 1, assessmentId: 1, label: 'Baseline · 6 Oct 2026', fromFrame: 0, toFrame: 9 },
      { clipId: 2, assessmentId: 2, label: 'Re-test · 1 Dec 2026', fromFrame: 0, toFrame: 9 },
    ];
    expect(clipTitle({ caption: ' Hip drive ', panels, kind: 'side_by_side' })).toBe('Hip drive');
    expect(clipTitle({ caption: '', panels, kind: 'side_by_side' })).toBe('Side by side: Baseline · 6 Oct 2026 and Re-test · 1 Dec 2026');
    expect(clipTitle({ caption: '', panels: panels.slice(0, 1), kind: 'single' })).toBe('Annotated clip of Baseline · 6 Oct 2026');
    expect(clipFactsText({ factor: 0.25, durationS: 8.2 })).toBe('1/4 speed · 8 s');
  });
});
