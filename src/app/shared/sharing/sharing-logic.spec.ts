import type { ProcessingEvent } from '../../../contracts/processing';
import { describe, expect, it } from 'vitest';
import type { Still } from '../../../contracts/sharing';
import { CAPTION_MAX } from '../../../contracts/sharing';
import {
  sharedListStep,
  baselineChoices,
  defaultBaseline,
  downloadUrl,
  nextAssessment,
  panelText,
  positionText,
  progressPercent,
  publishButton,
  publishConfirmText,
  stepIndex,
  stillAlt,
  stillChoices,
  stillSrc,
  summaryStateText,
  swipeStep,
  textCount,
  todayIso,
} from './sharing-logic';

const still = (over: Partial<Still> = {}): Still => ({
  id: 1,
  athleteId: 7,
  assessmentId: 20,
  kind: 'frame',
  panels: [{ clipId: 3, assessmentId: 20, frameIndex: 41, timeS: 0.68, label: 'Re-test · 1 Dec 2026' }],
  caption: '',
  showAngles: true,
  status: 'ready',
  progress: 1,
  error: null,
  width: 1280,
  height: 720,
  labels: [],
  layout: null,
  publishedAt: null,
  publishedBy: null,
  createdAt: '2026-12-01T10:00:00Z',
  createdBy: 'Tobin',
  imageUrl: '/api/stills/1/image',
  phoneImageUrl: '/api/stills/1/image?size=phone',
  ...over,
});

describe('textCount', () => {
  it('counts trimmed code points against the limit', () => {
    expect(textCount('  hip  ', CAPTION_MAX)).toMatchObject({ length: 3, remaining: 277, over: false, near: false, label: '3 / 280' });
    expect(textCount('🏃'.repeat(2), 10).length).toBe(2);
  });
  it('is near in the last tenth and over past the limit', () => {
    expect(textCount('x'.repeat(260), CAPTION_MAX)).toMatchObject({ near: true, over: false });
    expect(textCount('x'.repeat(280), CAPTION_MAX)).toMatchObject({ remaining: 0, over: false });
    expect(textCount('x'.repeat(281), CAPTION_MAX)).toMatchObject({ remaining: -1, over: true, near: false });
  });
});

describe('sharedListStep', () => {
  const event = (over: Partial<ProcessingEvent>): ProcessingEvent => ({
    subject: 'still',
    id: 5,
    kind: 'render_still',
    state: 'running',
    progress: null,
    error: null,
    ...over,
  });
  const shown = { stills: [{ id: 5, status: 'rendering' as const }], summaries: [{ id: 8, status: 'ready' as const }] };

  it('sets the progress of a shown render in place', () => {
    expect(sharedListStep(event({ progress: { done: 40, total: 100 } }), shown)).toEqual({
      kind: 'progress',
      subject: 'still',
      id: 5,
      progress: 0.4,
    });
  });

  it('fetches on any other change and for what the tab does not show yet', () => {
    expect(sharedListStep(event({ state: 'ready' }), shown)).toEqual({ kind: 'fetch', subject: 'still', id: 5 });
    expect(sharedListStep(event({ id: 6, progress: { done: 1, total: 100 } }), shown)).toEqual({ kind: 'fetch', subject: 'still', id: 6 });
    expect(sharedListStep(event({ subject: 'summary', id: 8, state: 'queued' }), shown)).toEqual({
      kind: 'fetch',
      subject: 'summary',
      id: 8,
    });
  });

  it('drops a cancelled render and leaves clips to their own page', () => {
    expect(sharedListStep(event({ state: 'cancelled' }), shown)).toEqual({ kind: 'drop', subject: 'still', id: 5 });
    expect(sharedListStep(event({ subject: 'clip' }), shown)).toEqual({ kind: 'ignore' });
  });
});

describe('progressPercent', () => {
  it('clamps and rounds', () => {
    expect(progressPercent(0.456)).toBe(46);
    expect(progressPercent(-1)).toBe(0);
    expect(progressPercent(3)).toBe(100);
    expect(progressPercent(Number.NaN)).toBe(0);
    expect(progressPercent(null)).toBe(0);
  });
});

describe('publishButton', () => {
  it('offers Publish only for a ready, unpublished item', () => {
    expect(publishButton({ status: 'ready', publishedAt: null })).toMatchObject({ action: 'publish', disabled: false });
    expect(publishButton({ status: 'rendering', publishedAt: null })).toMatchObject({ action: 'publish', disabled: true });
    expect(publishButton({ status: 'failed', publishedAt: null })).toMatchObject({
      action: 'publish',
      disabled: true,
      state: 'Rendering failed',
    });
  });
  it('offers Unpublish for a published item', () => {
    expect(publishButton({ status: 'ready', publishedAt: '2026-12-01T10:00:00Z' })).toMatchObject({
      action: 'unpublish',
      label: 'Unpublish',
      disabled: false,
    });
  });
});

describe('swipeStep', () => {
  it('drag left goes to the next, drag right to the previous', () => {
    expect(swipeStep(-80, 5)).toBe(1);
    expect(swipeStep(90, -10)).toBe(-1);
  });
  it('ignores short and mostly vertical drags', () => {
    expect(swipeStep(-50, 0)).toBe(0);
    expect(swipeStep(40, 0)).toBe(0);
    expect(swipeStep(-70, 120)).toBe(0);
  });
});

describe('stepIndex and positionText', () => {
  it('stops at both ends', () => {
    expect(stepIndex(0, -1, 3)).toBe(0);
    expect(stepIndex(1, 1, 3)).toBe(2);
    expect(stepIndex(2, 1, 3)).toBe(2);
    expect(stepIndex(4, 0, 0)).toBe(0);
  });
  it('says n of m', () => {
    expect(positionText(1, 5)).toBe('2 of 5');
    expect(positionText(0, 0)).toBe('0 of 0');
  });
});

describe('stillAlt and panelText', () => {
  it('uses the caption as alternative text', () => {
    expect(stillAlt(still({ caption: ' Hip at toe-off ' }))).toBe('Hip at toe-off');
  });
  it('falls back to what the panels show', () => {
    expect(stillAlt(still())).toBe('Still of Re-test · 1 Dec 2026');
    const pair = still({
      kind: 'pair',
      panels: [
        { clipId: 2, assessmentId: 10, frameIndex: 40, timeS: 0.66, label: 'Baseline · 6 Oct 2026' },
        { clipId: 3, assessmentId: 20, frameIndex: 41, timeS: 0.68, label: 'Re-test · 1 Dec 2026' },
      ],
    });
    expect(panelText(pair)).toBe('Baseline · 6 Oct 2026 | Re-test · 1 Dec 2026');
    expect(stillAlt(pair)).toBe('Side-by-side still: Baseline · 6 Oct 2026 | Re-test · 1 Dec 2026');
  });
});

describe('publishConfirmText', () => {
  it('says the athlete gets an e-mail notice', () => {
    const t = publishConfirmText('still', 'Ada Kestrel');
    expect(t.message).toContain('Ada Kestrel will see this still');
    expect(t.message).toContain('e-mail notice');
    expect(publishConfirmText('summary', '').title).toBe('Publish this visit summary?');
  });

  it('promises no e-mail to an athlete without an account, and says how they get access', () => {
    const t = publishConfirmText('summary', 'Ada Kestrel', false);
    expect(t.message).toContain('Ada Kestrel has no Trailframe account yet');
    expect(t.message).toContain('no e-mail goes out');
    expect(t.message).toContain('Invite to Trailframe');
    expect(t.confirmLabel).toBe('Publish');
  });
});

describe('nextAssessment', () => {
  const list = [
    { id: 1, date: '2026-10-06' },
    { id: 3, date: '2027-01-20' },
    { id: 2, date: '2026-12-02' },
  ];
  it('is the soonest dated today or later', () => {
    expect(nextAssessment(list, '2026-12-02')?.id).toBe(2);
    expect(nextAssessment(list, '2026-12-03')?.id).toBe(3);
    expect(nextAssessment(list, '2027-02-01')).toBeNull();
  });
  it('todayIso is the local calendar date', () => {
    expect(todayIso(new Date(2026, 0, 5, 23, 59))).toBe('2026-01-05');
  });
});

describe('baselineChoices and stillChoices', () => {
  const visits = [
    { id: 20, date: '2026-12-01' },
    { id: 10, date: '2026-10-06' },
    { id: 30, date: '2027-01-10' },
  ];
  it('offers earlier visits only', () => {
    expect(baselineChoices(visits, 20).map((a) => a.id)).toEqual([10]);
    expect(baselineChoices(visits, 30).map((a) => a.id)).toEqual([20, 10]);
    expect(baselineChoices(visits, null)).toEqual([]);
  });
  it('offers ready stills of the chosen visits, pairs by any panel', () => {
    const a = still({ id: 1 });
    const b = still({ id: 2, assessmentId: 99, panels: [{ clipId: 9, assessmentId: 10, frameIndex: 1, timeS: 0, label: 'B' }] });
    const c = still({ id: 3, status: 'rendering' });
    const d = still({ id: 4, assessmentId: 55, panels: [] });
    expect(stillChoices([a, b, c, d], [20, null]).map((s) => s.id)).toEqual([1]);
    expect(stillChoices([a, b, c, d], [20, 10]).map((s) => s.id)).toEqual([1, 2]);
  });
});

describe('summaryStateText and downloadUrl', () => {
  it('describes the state', () => {
    expect(summaryStateText({ status: 'rendering', publishedAt: null, pageCount: null, error: null })).toBe('Rendering…');
    expect(summaryStateText({ status: 'failed', publishedAt: null, pageCount: null, error: 'No fonts' })).toBe(
      'Rendering failed: No fonts',
    );
    expect(summaryStateText({ status: 'ready', publishedAt: 'x', pageCount: 2, error: null })).toBe('2 pages · published');
    expect(summaryStateText({ status: 'ready', publishedAt: null, pageCount: 1, error: null })).toBe('1 page · not published');
  });
  it('adds download=1', () => {
    expect(downloadUrl('/api/summaries/4/pdf')).toBe('/api/summaries/4/pdf?download=1');
    expect(downloadUrl('/api/summaries/4/pdf?v=2')).toBe('/api/summaries/4/pdf?v=2&download=1');
  });
});

describe('defaultBaseline', () => {
  const visits = [
    { id: 30, date: '2027-01-10', kind: 'retest' },
    { id: 20, date: '2026-12-01', kind: 'retest' },
    { id: 10, date: '2026-10-06', kind: 'baseline' },
  ];
  it('compares a Re-test with the latest earlier Baseline', () => {
    expect(defaultBaseline(visits, 30)).toBe(10);
    expect(defaultBaseline(visits, 20)).toBe(10);
  });
  it('summarises a Baseline on its own', () => {
    expect(defaultBaseline(visits, 10)).toBeNull();
    expect(defaultBaseline(visits, null)).toBeNull();
  });
});

describe('stillSrc', () => {
  it("keeps the server's render version and changes when the caption or state changes, and only then", () => {
    const a = stillSrc('/api/stills/1/image.png?v=2', still({ caption: 'One' }));
    expect(a).toMatch(/^\/api\/stills\/1\/image\.png\?v=2&s=[0-9a-z]+$/);
    expect(stillSrc('/api/stills/1/image.png?v=2', still({ caption: 'One' }))).toBe(a);
    expect(stillSrc('/api/stills/1/image.png?v=2', still({ caption: 'One', status: 'rendering' }))).not.toBe(a);
    expect(stillSrc('/api/stills/1/image.png?v=2', still({ caption: 'Two' }))).not.toBe(a);
  });
});
