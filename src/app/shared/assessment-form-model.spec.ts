import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, NonNullableFormBuilder } from '@angular/forms';
import type { Assessment } from '../../contracts/api';
import { SpeedUnit } from '../../contracts/assessment';
import {
  assessmentToFormValue,
  convertSpeedText,
  createAssessmentForm,
  defaultKind,
  formValueToWrite,
  formatSpeed,
  newAssessmentValue,
  readSpeed,
  speedErrorText,
  speedLimitsText,
  speedValue,
} from './assessment-form-model';

function assessment(overrides: Partial<Assessment> = {}): Assessment {
  return {
    id: 4,
    athleteId: 9,
    date: '2025-03-14',
    kind: 'baseline',
    surface: 'treadmill',
    speedMps: 1000 / 330,
    speedUnit: 's_per_km',
    inclinePercent: 1,
    shoes: 'Daily trainers',
    cameraNotes: null,
    notes: 'Left knee sore after 8 km',
    clipCount: 2,
    createdAt: '2025-03-14T09:00:00Z',
    updatedAt: '2025-03-14T09:00:00Z',
    ...overrides,
  };
}

/** A speed control with its unit sibling, as in the form. */
function speedControl(value: string, unit: SpeedUnit) {
  const group = new FormGroup({
    value: new FormControl(value, { nonNullable: true, validators: speedValue }),
    unit: new FormControl(unit),
  });
  group.controls.value.updateValueAndValidity();
  return group.controls.value;
}

describe('readSpeed', () => {
  it('reads km/h and mph as numbers, paces as m:ss in seconds', () => {
    expect(readSpeed('12.5', 'kmh')).toBe(12.5);
    expect(readSpeed('12,5', 'kmh')).toBe(12.5);
    expect(readSpeed(' 7 ', 'mph')).toBe(7);
    expect(readSpeed('5:30', 's_per_km')).toBe(330);
    expect(readSpeed('8:45', 's_per_mile')).toBe(525);
    expect(readSpeed('5.5', 's_per_km')).toBe(330); // plain minutes, as parsePace allows
  });

  it('treats empty as not recorded and anything else as invalid', () => {
    expect(readSpeed('', 'kmh')).toBeNull();
    expect(readSpeed('  ', 's_per_km')).toBeNull();
    for (const [text, unit] of [
      ['fast', 'kmh'],
      ['5:30', 'kmh'],
      ['-3', 'mph'],
      ['0', 'kmh'],
      ['5:75', 's_per_km'],
      ['0:00', 's_per_mile'],
    ] as [string, SpeedUnit][]) {
      expect(readSpeed(text, unit), `${text} ${unit}`).toBe('invalid');
    }
  });
});

describe('speed limits', () => {
  // BELT_SPEED_LIMITS_MPS is 1–10 m/s. Worked by hand [calc]: 1 m/s = 3.6 km/h = 2.237 mph,
  // 16:40 min/km, 26:49.3 min/mile; 10 m/s = 36 km/h = 22.37 mph, 1:40 min/km, 2:40.9 min/mile.
  it('states the range in the chosen unit, rounded inwards', () => {
    expect(speedLimitsText('kmh')).toEqual({ low: '3.6', high: '36' });
    expect(speedLimitsText('mph')).toEqual({ low: '2.3', high: '22.3' });
    expect(speedLimitsText('s_per_km')).toEqual({ low: '1:40', high: '16:40' });
    expect(speedLimitsText('s_per_mile')).toEqual({ low: '2:41', high: '26:49' });
  });

  it('checks the speed after converting it to m/s', () => {
    expect(speedControl('36', 'kmh').errors).toBeNull();
    expect(speedControl('3.6', 'kmh').errors).toBeNull();
    expect(speedControl('37', 'kmh').errors).toEqual({ speedRange: { low: '3.6', high: '36' } });
    expect(speedControl('3.5', 'kmh').hasError('speedRange')).toBe(true);
    expect(speedControl('22.3', 'mph').errors).toBeNull();
    expect(speedControl('22.4', 'mph').hasError('speedRange')).toBe(true);
    expect(speedControl('1:40', 's_per_km').errors).toBeNull();
    expect(speedControl('1:39', 's_per_km').hasError('speedRange')).toBe(true);
    expect(speedControl('16:40', 's_per_km').errors).toBeNull();
    expect(speedControl('16:41', 's_per_km').hasError('speedRange')).toBe(true);
    expect(speedControl('2:41', 's_per_mile').errors).toBeNull();
    expect(speedControl('2:40', 's_per_mile').hasError('speedRange')).toBe(true);
    expect(speedControl('', 'kmh').errors).toBeNull();
  });

  it('explains the problem in the unit the coach chose', () => {
    expect(speedErrorText(speedControl('5:30', 'kmh'), 'kmh')).toBe('Enter a number, e.g. 12.5');
    expect(speedErrorText(speedControl('5.30.1', 's_per_km'), 's_per_km')).toBe('Enter a pace as minutes:seconds, e.g. 5:30');
    expect(speedErrorText(speedControl('40', 'kmh'), 'kmh')).toBe('Enter a speed between 3.6 and 36 km/h');
    expect(speedErrorText(speedControl('30:00', 's_per_mile'), 's_per_mile')).toBe('Enter a pace between 2:41 and 26:49 min/mile');
  });
});

describe('convertSpeedText', () => {
  // 12 km/h = 3.333 m/s = 7.456 mph = 5:00 min/km = 8:02.8 min/mile [calc].
  it('re-expresses a typed speed in the new unit', () => {
    expect(convertSpeedText('12', 'kmh', 'mph')).toBe('7.5');
    expect(convertSpeedText('12', 'kmh', 's_per_km')).toBe('5:00');
    expect(convertSpeedText('12', 'kmh', 's_per_mile')).toBe('8:03');
    expect(convertSpeedText('5:00', 's_per_km', 'kmh')).toBe('12');
  });

  it('leaves empty or unreadable text as typed', () => {
    expect(convertSpeedText('', 'kmh', 'mph')).toBe('');
    expect(convertSpeedText('quick', 'kmh', 'mph')).toBe('quick');
    expect(convertSpeedText('12', 'kmh', 'kmh')).toBe('12');
  });
});

describe('formatSpeed', () => {
  it('shows a speed in the unit it was typed in', () => {
    expect(formatSpeed(12.5 / 3.6, 'kmh')).toBe('12.5 km/h');
    expect(formatSpeed(3.5, 'mph')).toBe('7.8 mph'); // 3.5 × 3600 / 1609.344 = 7.83
    expect(formatSpeed(1000 / 330, 's_per_km')).toBe('5:30 min/km');
    expect(formatSpeed(1609.344 / 531, 's_per_mile')).toBe('8:51 min/mile');
    expect(formatSpeed(null, 'kmh')).toBe('Not recorded');
  });
});

describe('assessment form → AssessmentWrite', () => {
  let fb: NonNullableFormBuilder;
  beforeEach(() => (fb = TestBed.inject(NonNullableFormBuilder)));

  it('starts a new assessment today, as Baseline only when there is none yet', () => {
    expect(defaultKind([])).toBe('baseline');
    expect(defaultKind([{ kind: 'retest' }])).toBe('baseline');
    expect(defaultKind([{ kind: 'retest' }, { kind: 'baseline' }])).toBe('retest');
    const value = newAssessmentValue('retest', 'mi', new Date(2025, 5, 15, 14, 30));
    expect(value.date).toEqual(new Date(2025, 5, 15));
    expect(value.speed).toEqual({ value: '', unit: 'mph' });
    expect(newAssessmentValue('baseline').speed.unit).toBe('kmh');
  });

  it('sends the speed as typed in its unit (paces in seconds) and text trimmed', () => {
    const form = createAssessmentForm(fb, newAssessmentValue('baseline', 'km', new Date(2025, 2, 14)));
    form.patchValue({
      speed: { value: '5:30', unit: 's_per_km' },
      inclinePercent: 1.5,
      shoes: '  Race flats ',
      cameraNotes: '',
      notes: ' Watch the left knee ',
    });
    expect(form.valid).toBe(true);
    expect(formValueToWrite(form.getRawValue())).toEqual({
      date: '2025-03-14',
      kind: 'baseline',
      surface: 'treadmill',
      speed: { value: 330, unit: 's_per_km' },
      inclinePercent: 1.5,
      shoes: 'Race flats',
      cameraNotes: null,
      notes: 'Watch the left knee',
    });
  });

  it('sends no speed when left empty, and no incline off the treadmill', () => {
    const form = createAssessmentForm(fb, newAssessmentValue('retest', 'km', new Date(2025, 2, 14)));
    form.patchValue({ surface: 'trail', inclinePercent: 4 });
    expect(formValueToWrite(form.getRawValue())).toMatchObject({ surface: 'trail', speed: null, inclinePercent: null });
  });

  it('validates incline on a treadmill only', () => {
    const form = createAssessmentForm(fb, newAssessmentValue('retest'));
    form.controls.inclinePercent.setValue(45);
    expect(form.controls.inclinePercent.hasError('max')).toBe(true);
    form.controls.surface.setValue('road');
    // The component calls syncIncline on surface changes; do the same here.
    form.controls.inclinePercent.disable();
    expect(form.valid).toBe(true);
  });

  it('round-trips a stored assessment through the form', () => {
    const stored = assessment();
    const value = assessmentToFormValue(stored);
    expect(value.speed).toEqual({ value: '5:30', unit: 's_per_km' });
    expect(value.date).toEqual(new Date(2025, 2, 14));
    expect(formValueToWrite(value)).toEqual({
      date: '2025-03-14',
      kind: 'baseline',
      surface: 'treadmill',
      speed: { value: 330, unit: 's_per_km' },
      inclinePercent: 1,
      shoes: 'Daily trainers',
      cameraNotes: null,
      notes: 'Left knee sore after 8 km',
    });
    expect(assessmentToFormValue(assessment({ speedMps: 12.5 / 3.6, speedUnit: 'kmh' })).speed.value).toBe('12.5');
    expect(assessmentToFormValue(assessment({ speedMps: null })).speed.value).toBe('');
  });
});
