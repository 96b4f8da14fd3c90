import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { Assessment } from '../../../../contracts/api';
import { SUMMARY_TEXT_MAX } from '../../../../contracts/sharing';
import { aStill, aSummary } from '../test-stills';
import { SummaryDialog, type SummaryDialogData } from './summary-dialog';

const visit = (id: number, date: string, kind: Assessment['kind']): Assessment => ({
  id,
  athleteId: 9,
  date,
  kind,
  surface: 'treadmill',
  speedMps: 3,
  speedUnit: 'kmh',
  inclinePercent: 0,
  shoes: null,
  cameraNotes: null,
  notes: null,
  clipCount: 1,
  createdAt: `${date}T09:00:00Z`,
  updatedAt: `${date}T09:00:00Z`,
});

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('SummaryDialog', () => {
  let fixture: ComponentFixture<SummaryDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let close: ReturnType<typeof vi.fn>;

  async function open(data: SummaryDialogData) {
    close = vi.fn();
    TestBed.configureTestingModule({
      imports: [SummaryDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SummaryDialog);
    element = fixture.nativeElement;
    fixture.detectChanges();
    backend
      .expectOne('/api/athletes/9/assessments')
      .flush({ assessments: [visit(20, '2026-11-24', 'retest'), visit(10, '2026-10-06', 'baseline')] });
    await settle();
  }
  const settle = async () => {
    await wait(10);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  const type = async (name: string, text: string) => {
    const area = element.querySelector<HTMLTextAreaElement>(`textarea[name="${name}"]`)!;
    area.value = text;
    area.dispatchEvent(new Event('input'));
    await settle();
  };
  const submit = () => element.querySelector<HTMLButtonElement>('button[type="submit"]')!;
  afterEach(() => backend.verify());

  const stills = [
    aStill({ id: 1, caption: 'Re-test frame' }),
    aStill({
      id: 2,
      kind: 'pair',
      caption: 'The pair',
      panels: [
        { clipId: 3, assessmentId: 10, frameIndex: 36, timeS: 0.6, label: 'Baseline' },
        { clipId: 7, assessmentId: 20, frameIndex: 36, timeS: 0.6, label: 'Re-test' },
      ],
    }),
    aStill({
      id: 3,
      assessmentId: 99,
      caption: 'Another visit',
      panels: [{ clipId: 8, assessmentId: 99, frameIndex: 1, timeS: 0, label: 'Other' }],
    }),
  ];

  it('summarises the newest Re-test against the Baseline with the chosen stills', async () => {
    await open({ athleteId: 9, stills });
    expect(element.textContent).toContain('Re-test · 24 Nov 2026');
    expect(element.textContent).toContain('Baseline · 6 Oct 2026');
    // Stills of these two visits only.
    expect(element.textContent).toContain('Re-test frame');
    expect(element.textContent).toContain('The pair');
    expect(element.textContent).not.toContain('Another visit');
    element.querySelectorAll<HTMLInputElement>('input[type="checkbox"]')[1]!.click();
    await type('findings', '  Hip extends further.  ');
    await type('planText', 'Keep the drills.');
    expect(element.textContent).toContain(`20 / ${SUMMARY_TEXT_MAX}`);
    submit().click();
    const req = backend.expectOne('/api/assessments/20/summaries');
    expect(req.request.body).toEqual({
      baselineAssessmentId: 10,
      findings: 'Hip extends further.',
      planText: 'Keep the drills.',
      stillIds: [2],
    });
    const created = aSummary({ status: 'rendering', progress: 0 });
    req.flush(created, { status: 202, statusText: 'Accepted' });
    await settle();
    expect(close).toHaveBeenCalledWith(created);
  });

  it('refuses findings over the limit before sending, and keeps text the server refuses', async () => {
    await open({ athleteId: 9, stills });
    await type('findings', 'x'.repeat(SUMMARY_TEXT_MAX + 1));
    expect(submit().disabled).toBe(true);
    expect(element.textContent).toContain('1 characters over the limit');
    await type('findings', 'Fine words');
    await type('planText', 'A plan');
    submit().click();
    backend.expectOne('/api/assessments/20/summaries').flush(
      {
        error: {
          code: 'validation',
          message: 'Check the fields',
          details: [{ path: ['planText'], message: 'The plan cannot be only spaces' }],
        },
      },
      { status: 422, statusText: 'Unprocessable' },
    );
    await settle();
    expect(close).not.toHaveBeenCalled();
    expect(element.textContent).toContain('The plan cannot be only spaces');
    expect(element.querySelector<HTMLTextAreaElement>('textarea[name="findings"]')!.value).toBe('Fine words');
    expect(element.querySelector<HTMLTextAreaElement>('textarea[name="planText"]')!.value).toBe('A plan');
  });
});
