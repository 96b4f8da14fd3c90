import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { LOCALE_ID } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { Assessment } from '../../../contracts/api';
import { DATE_FIELD_DISPLAY, DATE_FIELD_HINT, provideIsoDateAdapter } from '../iso-date-adapter';
import { AssessmentFormGroup } from '../assessment-form-model';
import { AssessmentDialog, AssessmentDialogData } from './assessment-dialog';

function saved(overrides: Partial<Assessment> = {}): Assessment {
  return {
    id: 31,
    athleteId: 9,
    date: '2025-03-14',
    kind: 'retest',
    surface: 'treadmill',
    speedMps: 1000 / 330,
    speedUnit: 's_per_km',
    inclinePercent: 1,
    shoes: null,
    cameraNotes: null,
    notes: null,
    clipCount: 0,
    createdAt: '2025-03-14T09:00:00Z',
    updatedAt: '2025-03-14T09:00:00Z',
    ...overrides,
  };
}

describe('AssessmentDialog', () => {
  let fixture: ComponentFixture<AssessmentDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let close: ReturnType<typeof vi.fn>;
  let form: AssessmentFormGroup;

  function open(data: AssessmentDialogData) {
    close = vi.fn();
    TestBed.configureTestingModule({
      imports: [AssessmentDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideIsoDateAdapter(),
        { provide: LOCALE_ID, useValue: 'en-GB' },
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AssessmentDialog);
    element = fixture.nativeElement;
    form = (fixture.componentInstance as unknown as { form: AssessmentFormGroup }).form;
    fixture.detectChanges();
  }

  afterEach(() => backend.verify());

  const submit = () => {
    element.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    fixture.detectChanges();
  };
  const speedInput = () => element.querySelector<HTMLInputElement>('input[formcontrolname="value"]')!;

  it('starts today as the kind it was given, with the date shown in words and a day/month/year hint', async () => {
    open({ athleteId: 9, kind: 'retest', distanceUnit: 'mi' });
    await fixture.whenStable();
    const today = new Date();
    const shown = new Intl.DateTimeFormat('en-GB', DATE_FIELD_DISPLAY).format(today);
    expect(element.querySelector<HTMLInputElement>('input[formcontrolname="date"]')!.value).toBe(shown);
    expect(form.controls.kind.value).toBe('retest');
    expect(form.controls.speed.controls.unit.value).toBe('mph');
    expect(element.textContent).toContain(DATE_FIELD_HINT);
    expect(element.textContent).not.toContain('YYYY');
  });

  it('creates the assessment with a pace typed as m:ss and closes with it', async () => {
    open({ athleteId: 9, kind: 'baseline' });
    form.controls.speed.controls.unit.setValue('s_per_km');
    speedInput().value = '5:30';
    speedInput().dispatchEvent(new Event('input'));
    form.controls.shoes.setValue(' Daily trainers ');
    submit();
    const req = backend.expectOne('/api/athletes/9/assessments');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toMatchObject({
      kind: 'baseline',
      surface: 'treadmill',
      speed: { value: 330, unit: 's_per_km' },
      inclinePercent: null,
      shoes: 'Daily trainers',
    });
    req.flush(saved({ kind: 'baseline' }), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(close).toHaveBeenCalledWith(expect.objectContaining({ id: 31 }));
  });

  it('saving again after the answer was lost sends the same Idempotency-Key (one visit is made); changed fields a new key', async () => {
    open({ athleteId: 9, kind: 'baseline' });
    /** The failed save has finished (the button is enabled again). */
    const settled = async () => {
      await new Promise((r) => setTimeout(r, 10));
      fixture.detectChanges();
    };
    speedInput().value = '12';
    speedInput().dispatchEvent(new Event('input'));
    submit();
    const first = backend.expectOne('/api/athletes/9/assessments');
    const key = first.request.headers.get('Idempotency-Key');
    expect(key).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
    first.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settled();
    submit();
    const again = backend.expectOne('/api/athletes/9/assessments');
    expect(again.request.headers.get('Idempotency-Key')).toBe(key);
    again.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settled();
    form.controls.shoes.setValue('Racing flats');
    submit();
    const changed = backend.expectOne('/api/athletes/9/assessments');
    expect(changed.request.headers.get('Idempotency-Key')).not.toBe(key);
    changed.flush(saved({ kind: 'baseline' }), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(close).toHaveBeenCalledTimes(1);
  });

  it('explains a speed outside the accepted range in the chosen unit and sends nothing', async () => {
    open({ athleteId: 9, kind: 'baseline' });
    speedInput().value = '40';
    speedInput().dispatchEvent(new Event('input'));
    submit();
    await fixture.whenStable();
    backend.expectNone('/api/athletes/9/assessments');
    expect(element.querySelector('mat-error')?.textContent).toContain('Enter a speed between 3.6 and 36 km/h');
  });

  it("puts the server's 422 details on the matching fields", async () => {
    open({ athleteId: 9, kind: 'retest' });
    form.controls.speed.controls.value.setValue('12');
    submit();
    backend.expectOne('/api/athletes/9/assessments').flush(
      {
        error: {
          code: 'validation',
          message: 'Invalid assessment',
          details: [
            { path: ['speed', 'value'], message: 'Speed must be between 3.6 and 36.0 km/h.' },
            { path: ['date'], message: 'Date must be after 2000.' },
          ],
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    // Let the save's promise settle, then render.
    await Promise.resolve();
    await fixture.whenStable();
    expect(form.controls.speed.controls.value.errors).toEqual({ server: 'Speed must be between 3.6 and 36.0 km/h.' });
    expect(form.controls.speed.controls.value.value).toBe('12');
    expect(form.controls.date.errors).toEqual({ server: 'Date must be after 2000.' });
    expect(element.textContent).toContain('Speed must be between 3.6 and 36.0 km/h.');
    expect(close).not.toHaveBeenCalled();
  });

  it('edits an assessment with PATCH, showing its stored speed in its unit', async () => {
    open({ athleteId: 9, assessment: saved() });
    await fixture.whenStable();
    expect(speedInput().value).toBe('5:30');
    expect(element.querySelector('h2')?.textContent).toContain('Edit assessment');
    form.controls.surface.setValue('road');
    submit();
    const req = backend.expectOne('/api/assessments/31');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toMatchObject({ surface: 'road', inclinePercent: null, speed: { value: 330, unit: 's_per_km' } });
    req.flush(saved({ surface: 'road', inclinePercent: null }));
    await fixture.whenStable();
    expect(close).toHaveBeenCalled();
  });
});
