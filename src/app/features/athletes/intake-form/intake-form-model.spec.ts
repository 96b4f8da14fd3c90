import { TestBed } from '@angular/core/testing';
import { NonNullableFormBuilder } from '@angular/forms';
import type { AthleteDetail } from '../../../../contracts/api';
import { LIMITS } from '../../../../contracts/intake';
import {
  IntakeFormValue,
  convertDistance,
  createInjuryRow,
  createIntakeForm,
  createPainRow,
  detailToFormValue,
  distanceMax,
  duplicateRegions,
  formValueToIntake,
  setIntakeFormValue,
} from './intake-form-model';

const today = () => new Date(2025, 5, 15);

function detail(overrides: Partial<AthleteDetail> = {}): AthleteDetail {
  return {
    id: 9,
    firstName: 'Ada',
    lastName: 'Example',
    email: 'ada@runner.test',
    dateOfBirth: '1991-04-02',
    goalEvent: 'Half marathon',
    goalDate: '2025-10-12',
    coachId: 2,
    coachName: 'Robin Coach',
    hasAccount: false,
    invitationPending: false,
    videoConsent: true,
    maxPain: 4,
    createdAt: '2025-01-01T00:00:00Z',
    updatedAt: '2025-01-02T00:00:00Z',
    heightCm: 171,
    distanceUnit: 'km',
    weeklyDistance: 42.5,
    longestRecentRun: 18,
    surfaces: ['trail', 'road'],
    injuries: [{ id: 3, region: 'achilles', side: 'left', when: '2024-03', status: 'recovering', notes: 'Morning stiffness' }],
    pain: [{ region: 'knee', score: 4 }],
    consents: {
      videoRecording: { granted: true, recordedAt: '2025-01-02T10:00:00Z', recordedByName: 'Robin Coach' },
      shareStills: null,
    },
    notes: null,
    ...overrides,
  };
}

function emptyValue(): IntakeFormValue {
  return {
    dateOfBirth: null,
    heightCm: null,
    distanceUnit: 'km',
    weeklyDistance: null,
    longestRecentRun: null,
    goalEvent: '',
    goalDate: null,
    surfaces: [],
    injuries: [],
    pain: [],
    consents: { videoRecording: false, shareStills: false },
  };
}

describe('formValueToIntake', () => {
  it('sends empty answers as null and no rows', () => {
    expect(formValueToIntake(emptyValue())).toEqual({
      dateOfBirth: null,
      heightCm: null,
      distanceUnit: 'km',
      weeklyDistance: null,
      longestRecentRun: null,
      goalEvent: null,
      goalDate: null,
      surfaces: [],
      injuries: [],
      pain: [],
      consents: { videoRecording: false, shareStills: false },
    });
  });

  it('formats dates as YYYY-MM-DD, trims text and orders surfaces by the vocabulary', () => {
    const payload = formValueToIntake({
      ...emptyValue(),
      dateOfBirth: new Date(1991, 3, 2),
      goalDate: new Date(2025, 9, 12),
      goalEvent: '  Half marathon ',
      surfaces: ['treadmill', 'road', 'road'],
      distanceUnit: 'mi',
      weeklyDistance: 20,
    });
    expect(payload.dateOfBirth).toBe('1991-04-02');
    expect(payload.goalDate).toBe('2025-10-12');
    expect(payload.goalEvent).toBe('Half marathon');
    expect(payload.surfaces).toEqual(['road', 'treadmill']);
    expect(payload.distanceUnit).toBe('mi');
    expect(payload.weeklyDistance).toBe(20);
  });

  it('keeps injury ids of existing rows, omits them for new rows, and trims notes', () => {
    const payload = formValueToIntake({
      ...emptyValue(),
      injuries: [
        { id: 3, region: 'achilles', side: 'left', when: '2024-03', status: 'recovering', notes: ' stiff ' },
        // Typed where the browser has no month picker: stored as YYYY-MM all the same.
        { id: null, region: 'knee', side: 'right', when: ' Nov 2023 ', status: 'resolved', notes: '' },
      ],
      pain: [{ region: 'calf', score: 6 }],
    });
    expect(payload.injuries).toEqual([
      { id: 3, region: 'achilles', side: 'left', when: '2024-03', status: 'recovering', notes: 'stiff' },
      { region: 'knee', side: 'right', when: '2023-11', status: 'resolved', notes: '' },
    ]);
    expect(payload.pain).toEqual([{ region: 'calf', score: 6 }]);
  });

  it('round-trips what the server sent', () => {
    const d = detail();
    const payload = formValueToIntake(detailToFormValue(d));
    expect(payload).toEqual({
      dateOfBirth: d.dateOfBirth,
      heightCm: d.heightCm,
      distanceUnit: d.distanceUnit,
      weeklyDistance: d.weeklyDistance,
      longestRecentRun: d.longestRecentRun,
      goalEvent: d.goalEvent,
      goalDate: d.goalDate,
      surfaces: ['road', 'trail'],
      injuries: d.injuries,
      pain: d.pain,
      consents: { videoRecording: true, shareStills: false },
    });
  });
});

describe('convertDistance', () => {
  // 1 mi = 1.609344 km exactly (international mile); expected values worked by hand [calc].
  it('converts kilometres to miles and back, rounded to 0.1', () => {
    expect(convertDistance(40, 'km', 'mi')).toBe(24.9); // 40 / 1.609344 = 24.855
    expect(convertDistance(42.195, 'km', 'mi')).toBe(26.2); // 26.219
    expect(convertDistance(10, 'mi', 'km')).toBe(16.1); // 16.093
    expect(convertDistance(26.2, 'mi', 'km')).toBe(42.2); // 42.165
    expect(convertDistance(0, 'mi', 'km')).toBe(0);
  });

  it('leaves the same unit, empty fields and non-numbers alone', () => {
    expect(convertDistance(12.34, 'km', 'km')).toBe(12.34);
    expect(convertDistance(null, 'km', 'mi')).toBeNull();
    expect(convertDistance(Number.NaN, 'km', 'mi')).toBeNaN();
  });

  it('stays close to the first value after a round trip', () => {
    // Worst case: 0.05 mi of rounding (0.08 km) plus 0.05 km of rounding on the way back.
    for (const km of [5, 21.1, 63.7, 120, 399.9]) {
      const back = convertDistance(convertDistance(km, 'km', 'mi'), 'mi', 'km')!;
      expect(Math.abs(back - km)).toBeLessThanOrEqual(0.131);
    }
  });
});

describe('intake form validators', () => {
  let fb: NonNullableFormBuilder;
  beforeEach(() => (fb = TestBed.inject(NonNullableFormBuilder)));

  it('limits height to the shared range', () => {
    const form = createIntakeForm(fb, today);
    form.controls.heightCm.setValue(LIMITS.heightCm.max + 1);
    expect(form.controls.heightCm.hasError('max')).toBe(true);
    form.controls.heightCm.setValue(LIMITS.heightCm.min - 1);
    expect(form.controls.heightCm.hasError('min')).toBe(true);
    form.controls.heightCm.setValue(175);
    expect(form.controls.heightCm.valid).toBe(true);
  });

  it('converts the kilometre distance limits to the chosen unit', () => {
    expect(distanceMax(LIMITS.weeklyKm, 'km')).toBe(400);
    expect(distanceMax(LIMITS.weeklyKm, 'mi')).toBe(248.5);
    const form = createIntakeForm(fb, today);
    form.controls.weeklyDistance.setValue(300);
    expect(form.controls.weeklyDistance.valid).toBe(true);
    form.controls.distanceUnit.setValue('mi');
    form.controls.weeklyDistance.updateValueAndValidity();
    expect(form.controls.weeklyDistance.errors).toEqual({ max: { max: 248.5, actual: 300 } });
    form.controls.longestRecentRun.setValue(-1);
    expect(form.controls.longestRecentRun.hasError('min')).toBe(true);
  });

  it('refuses a date of birth in the future', () => {
    const form = createIntakeForm(fb, today);
    form.controls.dateOfBirth.setValue(new Date(2025, 5, 16));
    expect(form.controls.dateOfBirth.errors).toEqual({ futureDate: true });
  });

  it('limits the goal event length', () => {
    const form = createIntakeForm(fb, today);
    form.controls.goalEvent.setValue('x'.repeat(LIMITS.goalEvent + 1));
    expect(form.controls.goalEvent.hasError('maxlength')).toBe(true);
  });

  it('requires every part of an injury row and a past month, typed as 2024-03, 03/2024 or Mar 2024', () => {
    const row = createInjuryRow(fb, undefined, today);
    expect(row.controls.region.hasError('required')).toBe(true);
    expect(row.controls.side.hasError('required')).toBe(true);
    expect(row.controls.status.hasError('required')).toBe(true);
    expect(row.controls.when.hasError('required')).toBe(true);
    row.controls.when.setValue('2025-07');
    expect(row.controls.when.hasError('futureMonth')).toBe(true);
    // Where the browser has no month picker the month is typed: the app's en-GB forms are taken.
    for (const typed of ['March 2024', 'Mar 2024', '03/2024', '3/2024', '2024-03']) {
      row.controls.when.setValue(typed);
      expect(row.controls.when.errors, typed).toBeNull();
    }
    row.controls.when.setValue('July 2025');
    expect(row.controls.when.hasError('futureMonth')).toBe(true);
    for (const typed of ['13/2024', 'Marc 2024x', '2024', 'spring 2024', '2024-3']) {
      row.controls.when.setValue(typed);
      expect(row.controls.when.hasError('pattern'), typed).toBe(true);
    }
    row.controls.notes.setValue('x'.repeat(LIMITS.injuryNotes + 1));
    expect(row.controls.notes.hasError('maxlength')).toBe(true);
  });

  it('allows at most LIMITS.injuries injury rows', () => {
    const form = createIntakeForm(fb, today);
    for (let i = 0; i <= LIMITS.injuries; i++) form.controls.injuries.push(createInjuryRow(fb, undefined, today));
    expect(form.controls.injuries.hasError('maxlength')).toBe(true);
  });

  it('keeps pain scores within 0–10 in whole numbers', () => {
    const row = createPainRow(fb, { region: 'knee', score: 11 });
    expect(row.controls.score.hasError('max')).toBe(true);
    row.controls.score.setValue(2.5);
    expect(row.controls.score.hasError('integer')).toBe(true);
    row.controls.score.setValue(0);
    expect(row.valid).toBe(true);
  });

  it('refuses the same pain region twice', () => {
    expect(duplicateRegions([{ region: 'knee' }, { region: null }, { region: 'calf' }, { region: 'knee' }])).toEqual(['knee']);
    const form = createIntakeForm(fb, today);
    form.controls.pain.push(createPainRow(fb, { region: 'knee', score: 2 }));
    form.controls.pain.push(createPainRow(fb, { region: 'knee', score: 5 }));
    expect(form.controls.pain.errors).toEqual({ duplicateRegions: ['knee'] });
    form.controls.pain.at(1).controls.region.setValue('calf');
    expect(form.controls.pain.errors).toBeNull();
  });
});

describe('setIntakeFormValue', () => {
  it('rebuilds rows from the athlete and leaves the form pristine and valid', () => {
    const fb = TestBed.inject(NonNullableFormBuilder);
    const form = createIntakeForm(fb, today);
    form.controls.pain.push(createPainRow(fb));
    form.markAsDirty();
    setIntakeFormValue(form, fb, detailToFormValue(detail()), today);
    expect(form.controls.injuries.length).toBe(1);
    expect(form.controls.pain.length).toBe(1);
    expect(form.controls.pain.at(0).getRawValue()).toEqual({ region: 'knee', score: 4 });
    expect(form.controls.dateOfBirth.value).toEqual(new Date(1991, 3, 2));
    expect(form.dirty).toBe(false);
    expect(form.valid).toBe(true);
  });
});
