import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Assessment } from '../../../../contracts/api';
import type { AssessmentComparison, ComparisonRow } from '../../../../contracts/measures';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { stubJsdomCanvas } from '../../../shared/testing/jsdom-canvas';
import { ComparePage } from './compare-page';

/*
 * What the Re-test comparison page says, beyond drawing its canvases: the measures table row by
 * row (values with units, the change, the verdict in words), and the step counter of the frames
 * lined up at the same gait event. The server's answer is fixed here; its verdicts follow
 * REFERENCES.md: hip extension +7.0° against ±5.5° ([calc] half of Damsted et al. 2015's 11°
 * width) is beyond measurement error; fewer than 7 steps in a visit is too few to judge
 * (Dingenen et al. 2018 [pub]).
 */
const visit = (id: number, date: string, kind: Assessment['kind']) => ({ id, athleteId: 9, date, kind, clipCount: 1 }) as Assessment;
const baseline = visit(1, '2026-10-06', 'baseline');
const retest = visit(2, '2026-11-24', 'retest');

const row = (over: Partial<ComparisonRow>): ComparisonRow => ({
  key: 'cadence',
  side: null,
  label: 'Cadence',
  unit: 'steps/min',
  baseline: null,
  retest: null,
  baselineSteps: 8,
  retestSteps: 8,
  change: null,
  threshold: null,
  verdict: 'not_measured',
  direction: null,
  betterDirection: null,
  ...over,
});
const hipThreshold = { value: 5.5, unit: '°', source: 'Damsted et al. 2015', evidence: 'calc' as const, derivation: 'Half the 11° width.' };

const comparison: AssessmentComparison = {
  baseline,
  retest,
  rows: [
    row({
      key: 'hip_extension_toe_off',
      side: 'right',
      label: 'Hip extension at toe-off',
      unit: '°',
      baseline: 4,
      retest: 11,
      change: 7,
      threshold: hipThreshold,
      verdict: 'beyond_measurement_error',
      direction: 'better',
    }),
    row({
      key: 'knee_flexion_initial_contact',
      side: 'right',
      label: 'Knee flexion at initial contact',
      unit: '°',
      baseline: 17.2,
      retest: 19.4,
      change: 2.2,
      retestSteps: 5,
      threshold: { ...hipThreshold, value: 3.8 },
      verdict: 'too_few_steps',
      direction: 'larger',
    }),
    row({ baseline: 166, retest: 172, change: 6, verdict: 'no_threshold', direction: 'larger' }),
    row({ key: 'trunk_lean', label: 'Trunk lean', unit: '°', verdict: 'not_measured' }),
  ],
  baselineClips: [{ id: 11, nearSide: 'right', direction: 'left_to_right', frameCount: 100 }],
  retestClips: [{ id: 12, nearSide: 'right', direction: 'left_to_right', frameCount: 100 }],
};

const manifest = (frameCount: number) => ({ version: 1, frameCount, width: 640, height: 360, fps: 60, timestampsMs: [] });
const toeOffs = (clipId: number, frames: number[]) => ({
  clipId,
  revision: 1,
  landmarks: [],
  events: frames.map((frame) => ({ frame, side: 'right', kind: 'toe_off' })),
  scale: null,
  updatedAt: null,
  updatedByName: null,
});

describe('ComparePage content', () => {
  let fixture: ComponentFixture<ComparePage>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  let restoreJsdom: () => void;
  beforeAll(() => {
    // jsdom has no layout observer, no canvas drawing and no image decoding.
    restoreJsdom = stubJsdomCanvas();
  });
  afterAll(() => restoreJsdom());

  async function settle(): Promise<void> {
    for (let i = 0; i < 3; i++) {
      await new Promise((r) => setTimeout(r));
      fixture.detectChanges();
    }
  }
  /** Answers every open request the page made, as the server would for this fixed athlete. */
  function answer(): void {
    backend.match('/api/athletes/9').forEach((r) => r.flush({ id: 9, firstName: 'Ada', lastName: 'Kestrel' }));
    backend.match('/api/athletes/9/assessments').forEach((r) => r.flush({ assessments: [retest, baseline] }));
    backend.match((r) => r.url === '/api/athletes/9/comparison').forEach((r) => r.flush(comparison));
    backend.match((r) => r.url === '/api/athletes/9/measure-trends').forEach((r) => r.flush({ points: [] }));
    backend.match('/api/clips/11/manifest').forEach((r) => r.flush(manifest(100)));
    backend.match('/api/clips/12/manifest').forEach((r) => r.flush(manifest(100)));
    // Baseline: 3 right toe-offs; Re-test: 4 — the pages can line up 3 steps.
    backend.match('/api/clips/11/annotations').forEach((r) => r.flush(toeOffs(11, [10, 30, 50])));
    backend.match('/api/clips/12/annotations').forEach((r) => r.flush(toeOffs(12, [12, 32, 52, 72])));
    backend.match((r) => /\/api\/clips\/1[12]\/frames\/\d+$/.test(r.url)).forEach((r) => r.flush(new Blob(['jpeg'])));
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ComparePage],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ComparePage);
    fixture.componentRef.setInput('athleteId', '9');
    element = fixture.nativeElement;
    for (let i = 0; i < 4; i++) {
      await settle();
      answer();
    }
    await settle();
  });
  afterEach(() => fixture.destroy());

  const cells = (tr: Element) =>
    [...tr.querySelectorAll('th, td')].map((c) => c.querySelector('summary')?.textContent?.trim() ?? c.textContent!.trim());

  it('shows one row per measure and side: values with units, the change, the verdict in words', () => {
    const rows = [...element.querySelectorAll('section.measures tbody tr')].map(cells);
    expect(rows).toEqual([
      ['Hip extension at toe-off (right)', '4.0°', '11.0°', '+7.0°', 'Beyond measurement error · better'],
      [
        'Knee flexion at initial contact (right)',
        '17.2°',
        '19.4°',
        '+2.2°',
        'Too few steps to judge (8 and 5 steps; 7 needed in each visit)',
      ],
      ['Cadence', '166 steps/min', '172 steps/min', '+6 steps/min', 'No published threshold'],
      ['Trunk lean', '—', '—', '—', 'Not measured'],
    ]);
    const headers = [...element.querySelectorAll('section.measures thead th')].map((th) => th.textContent!.trim());
    expect(headers).toEqual(['Measure', 'Baseline', 'Re-test', 'Change', 'Verdict']);
  });

  it('explains the verdict with its threshold and source', () => {
    const hip = element.querySelector('section.measures tbody tr .citation')!.textContent!;
    expect(hip).toContain('±5.5°');
    expect(hip).toContain('Damsted et al. 2015');
  });

  it('choosing the same visit twice says why (the server refuses it) without an error behind the scenes, and a valid pair comes back', async () => {
    const page = fixture.componentInstance as unknown as { retestId: { set(id: number): void } };
    page.retestId.set(baseline.id);
    await settle();
    flushApiError(
      backend.expectOne((r) => r.url === '/api/athletes/9/comparison' && r.params.get('retest') === '1'),
      422,
      'Choose two different assessments to compare.',
      { code: 'same_assessment' },
    );
    await settle();
    expect(element.textContent).toContain("Couldn't compare these visits");
    expect(element.textContent).toContain('Choose two different assessments to compare.');

    page.retestId.set(retest.id);
    for (let i = 0; i < 3; i++) {
      await settle();
      answer();
    }
    await settle();
    expect(element.textContent).not.toContain("Couldn't compare these visits");
    expect(element.querySelector('.stepper [aria-live="polite"]')?.textContent?.trim()).toBe('Step 1 of 3');
  });

  it('a clip removed meanwhile (its manifest answers 404) says why with Try again instead of throwing, and the pair comes back', async () => {
    const page = fixture.componentInstance as unknown as { retestLoaded: { reload(): boolean } };
    page.retestLoaded.reload();
    await settle();
    backend.match('/api/clips/12/manifest').forEach((r) => flushApiError(r, 404, 'Clip not found.'));
    backend.match('/api/clips/12/annotations').forEach((r) => r.cancelled || flushApiError(r, 404, 'Clip not found.'));
    await settle();
    expect(element.textContent).toContain("Couldn't load the frames or marks");
    expect(element.textContent).toContain('Clip not found.');
    expect(element.querySelector('mat-progress-bar[aria-label="Loading frames"]')).toBeNull();
    expect(element.querySelector<HTMLButtonElement>('button.save-still')!.disabled).toBe(true);

    buttonWithText(element.querySelector('section.viewer')!, 'Try again').click();
    for (let i = 0; i < 3; i++) {
      await settle();
      answer();
    }
    await settle();
    expect(element.textContent).not.toContain("Couldn't load the frames or marks");
    expect(element.querySelector('.stepper [aria-live="polite"]')?.textContent?.trim()).toBe('Step 1 of 3');
  });

  it('failed trends say why with Try again, the rest of the page stays', async () => {
    const page = fixture.componentInstance as unknown as { trendKeys: { set(keys: string[]): void } };
    page.trendKeys.set(['cadence']);
    await settle();
    flushApiError(
      backend.expectOne((r) => r.url === '/api/athletes/9/measure-trends'),
      500,
      'The database is busy.',
    );
    await settle();
    const trends = element.querySelector('section.trends')!;
    expect(trends.textContent).toContain("Couldn't load the trends");
    expect(trends.textContent).toContain('The database is busy.');
    expect(element.querySelectorAll('section.measures tbody tr').length).toBe(4);
  });

  it('counts the steps both visits share at the chosen event and steps through them together', async () => {
    const counter = () => element.querySelector('.stepper [aria-live="polite"]')?.textContent?.trim();
    expect(counter()).toBe('Step 1 of 3');
    const next = element.querySelector<HTMLButtonElement>('button[aria-label="Next step"]')!;
    const previous = element.querySelector<HTMLButtonElement>('button[aria-label="Previous step"]')!;
    expect(previous.disabled).toBe(true);
    next.click();
    await settle();
    answer();
    await settle();
    expect(counter()).toBe('Step 2 of 3');
    next.click();
    await settle();
    answer();
    await settle();
    expect(counter()).toBe('Step 3 of 3');
    expect(next.disabled).toBe(true);
    const captions = [...element.querySelectorAll('figcaption')].map((f) => f.textContent!.replace(/\s+/g, ' ').trim());
    // Step 3 is the third toe-off of each clip: frame 50 of the Baseline, 52 of the Re-test.
    expect(captions[0]).toMatch(/^Baseline · .*2026 · frame 50$/);
    expect(captions[1]).toMatch(/^Re-test · .*2026 · frame 52$/);
  });
});
