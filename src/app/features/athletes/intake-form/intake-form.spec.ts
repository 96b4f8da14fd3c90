import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { LOCALE_ID } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { AthleteDetail } from '../../../../contracts/api';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { IntakeForm } from './intake-form';
import { IntakeFormGroup } from './intake-form-model';

function detail(overrides: Partial<AthleteDetail> = {}): AthleteDetail {
  return {
    id: 9,
    firstName: 'Ada',
    lastName: 'Example',
    email: null,
    dateOfBirth: '1991-04-02',
    goalEvent: 'Half marathon',
    goalDate: null,
    coachId: null,
    coachName: null,
    hasAccount: false,
    invitationPending: false,
    videoConsent: false,
    maxPain: 3,
    createdAt: '2025-01-01T00:00:00Z',
    updatedAt: '2025-01-02T00:00:00Z',
    heightCm: 171,
    distanceUnit: 'km',
    weeklyDistance: 40,
    longestRecentRun: 16,
    surfaces: ['road'],
    injuries: [{ id: 3, region: 'achilles', side: 'left', when: '2024-03', status: 'recovering', notes: '' }],
    pain: [{ region: 'knee', score: 3 }],
    consents: { videoRecording: null, shareStills: null },
    ...overrides,
  };
}

describe('IntakeForm', () => {
  let fixture: ComponentFixture<IntakeForm>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let snackBar: { open: ReturnType<typeof vi.fn> };
  let form: IntakeFormGroup;

  beforeEach(async () => {
    snackBar = { open: vi.fn() };
    TestBed.configureTestingModule({
      imports: [IntakeForm],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideIsoDateAdapter(),
        { provide: LOCALE_ID, useValue: 'en-GB' },
        { provide: MatSnackBar, useValue: snackBar },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(IntakeForm);
    fixture.componentRef.setInput('athlete', detail());
    element = fixture.nativeElement;
    form = (fixture.componentInstance as unknown as { form: IntakeFormGroup }).form;
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const saveButton = () =>
    [...element.querySelectorAll<HTMLButtonElement>('button[type="submit"]')].find((b) => b.textContent?.includes('Save intake'))!;

  it('shows the athlete as the server sent them, with the pain caution', () => {
    expect(element.querySelector<HTMLInputElement>('input[formcontrolname="heightCm"]')!.value).toBe('171');
    expect(element.querySelectorAll('.injury-row').length).toBe(1);
    expect(element.querySelectorAll('.pain-row').length).toBe(1);
    const caution = element.querySelector('#intake-pain')!.parentElement!.querySelector('app-caution-note[role="note"]');
    expect(caution?.textContent).toContain("they do not replace a licensed clinician's examination or judgement");
    expect(caution?.textContent).toContain('follow local regulations');
    expect(element.textContent).toContain('Consents to video recording of running for gait analysis');
    expect(form.pristine).toBe(true);
  });

  it('saves the whole intake with PUT and confirms', async () => {
    let saved: AthleteDetail | undefined;
    fixture.componentInstance.saved.subscribe((a) => (saved = a));
    form.controls.heightCm.setValue(172);
    form.controls.consents.controls.videoRecording.setValue(true);
    saveButton().click();
    const req = backend.expectOne('/api/athletes/9/intake');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toMatchObject({
      dateOfBirth: '1991-04-02',
      heightCm: 172,
      goalEvent: 'Half marathon',
      goalDate: null,
      surfaces: ['road'],
      injuries: [{ id: 3, region: 'achilles', side: 'left', when: '2024-03', status: 'recovering', notes: '' }],
      pain: [{ region: 'knee', score: 3 }],
      consents: { videoRecording: true, shareStills: false },
    });
    req.flush(detail({ heightCm: 172 }));
    await fixture.whenStable();
    expect(saved?.heightCm).toBe(172);
    expect(snackBar.open).toHaveBeenCalledWith('Intake saved', 'OK', expect.anything());
    expect(form.pristine).toBe(true);
  });

  it('does not send an invalid form and points at the problem', async () => {
    element.querySelector<HTMLButtonElement>('.section button[mat-stroked-button]')!.click(); // Add injury
    await fixture.whenStable();
    expect(element.querySelectorAll('.injury-row').length).toBe(2);
    saveButton().click();
    await fixture.whenStable();
    backend.expectNone('/api/athletes/9/intake');
    expect(element.querySelector('[role="alert"]')?.textContent).toContain('Some fields need attention');
    expect(element.textContent).toContain('Region is required');
  });

  it("maps the server's 422 details onto the fields and keeps what was typed", async () => {
    form.controls.injuries.at(0).controls.notes.setValue('Flared after hill repeats');
    saveButton().click();
    backend.expectOne('/api/athletes/9/intake').flush(
      {
        error: {
          code: 'validation',
          message: 'Invalid intake',
          details: [
            { path: ['injuries', 0, 'when'], message: 'Month is before the date of birth' },
            { path: ['consents'], message: 'Consent needs a witness' },
          ],
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await fixture.whenStable();
    const when = form.controls.injuries.at(0).controls.when;
    expect(when.errors).toEqual({ server: 'Month is before the date of birth' });
    expect(when.value).toBe('2024-03');
    expect(form.controls.injuries.at(0).controls.notes.value).toBe('Flared after hill repeats');
    expect(element.textContent).toContain('Month is before the date of birth');
    expect(element.querySelector('[role="alert"]')?.textContent).toContain('Consent needs a witness');
    expect(snackBar.open).not.toHaveBeenCalled();
  });

  it('flags a pain area listed twice', async () => {
    form.controls.pain.at(0).controls.region.setValue('knee');
    const addPain = [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Add painful area'))!;
    addPain.click();
    await fixture.whenStable();
    form.controls.pain.at(1).controls.region.setValue('knee');
    await fixture.whenStable();
    expect(form.controls.pain.errors).toEqual({ duplicateRegions: ['knee'] });
    expect(element.textContent).toContain('This area is already listed');
  });

  it('does not overwrite unsaved edits when the parent passes a refreshed record', async () => {
    form.controls.goalEvent.setValue('Trail 30 km');
    form.markAsDirty();
    fixture.componentRef.setInput('athlete', detail({ firstName: 'Adah' }));
    await fixture.whenStable();
    expect(form.controls.goalEvent.value).toBe('Trail 30 km');
  });

  it('shows dates in words as the app does elsewhere (en-GB), with a day/month/year hint and no YYYY', () => {
    expect(element.querySelector<HTMLInputElement>('input[formcontrolname="dateOfBirth"]')!.value).toBe('2 Apr 1991');
    expect(element.textContent).toContain('Day/month/year, e.g. 14/03/2024');
    expect(element.textContent).not.toContain('YYYY');
  });

  it('takes a birth date typed day first, keeps text it cannot read and says why', async () => {
    const input = element.querySelector<HTMLInputElement>('input[formcontrolname="dateOfBirth"]')!;
    const type = async (text: string) => {
      input.value = text;
      input.dispatchEvent(new Event('input'));
      input.dispatchEvent(new Event('blur'));
      await fixture.whenStable();
    };
    await type('14/03/1990');
    expect(form.controls.dateOfBirth.value).toEqual(new Date(1990, 2, 14));
    await type('31/02/1990');
    expect(form.controls.dateOfBirth.hasError('matDatepickerParse')).toBe(true);
    expect(input.value).toBe('31/02/1990');
    form.controls.dateOfBirth.markAsTouched();
    fixture.detectChanges();
    await fixture.whenStable();
    expect(element.querySelector('mat-error')?.textContent).toContain('Enter a real date as day/month/year, e.g. 14/03/2024');
  });

  it('converts the distances already typed when the unit is switched', async () => {
    const toggle = (label: string) =>
      [...element.querySelectorAll<HTMLButtonElement>('mat-button-toggle button')].find((b) => b.textContent?.includes(label))!;
    toggle('Miles').click();
    await fixture.whenStable();
    // 40 km / 1.609344 = 24.85 mi; 16 km = 9.94 mi [calc]
    expect(form.controls.weeklyDistance.value).toBe(24.9);
    expect(form.controls.longestRecentRun.value).toBe(9.9);
    expect(element.textContent).toContain('mi / week');
    toggle('Kilometres').click();
    await fixture.whenStable();
    expect(form.controls.weeklyDistance.value).toBe(40.1); // 24.9 mi = 40.07 km
    expect(form.controls.longestRecentRun.value).toBe(15.9); // 9.9 mi = 15.93 km
  });

  it('does not convert a record that arrives in miles', async () => {
    fixture.componentRef.setInput('athlete', detail({ id: 10, distanceUnit: 'mi', weeklyDistance: 30, longestRecentRun: 12 }));
    await fixture.whenStable();
    expect(form.controls.distanceUnit.value).toBe('mi');
    expect(form.controls.weeklyDistance.value).toBe(30);
    expect(form.controls.longestRecentRun.value).toBe(12);
  });
});
