import type { ReferenceBand } from '../../../contracts/measures';
import { bandForm, bandWrite, blankBand, hasDefault, isDefaultBand, sortBands, unitOf } from './band-form-model';

const hip: ReferenceBand = {
  key: 'hip_extension_toe_off',
  low: 10,
  high: null,
  unit: '°',
  context: 'textbook rule of thumb',
  source: 'Common practice; Souza 2016',
  evidence: 'trade',
};

describe('bandForm', () => {
  it('is valid for a one-sided band', () => {
    expect(bandForm(hip).valid).toBe(true);
  });

  it('needs at least one limit, and low not above high', () => {
    const f = bandForm(hip);
    f.controls.low.setValue(null);
    expect(f.hasError('noLimits')).toBe(true);
    f.controls.low.setValue(20);
    f.controls.high.setValue(5);
    expect(f.hasError('lowAboveHigh')).toBe(true);
    f.controls.high.setValue(25);
    expect(f.valid).toBe(true);
  });

  it('needs unit, context and source, not just spaces', () => {
    const f = bandForm(blankBand('cadence'));
    f.controls.low.setValue(150);
    f.controls.unit.setValue(' ');
    expect(f.controls.unit.hasError('required')).toBe(true);
    f.controls.source.setValue('   ');
    expect(f.controls.source.hasError('required')).toBe(true);
  });

  it('writes a trimmed body without the key', () => {
    const f = bandForm(hip);
    f.controls.context.setValue('  treadmill  ');
    expect(bandWrite(f.getRawValue())).toEqual({
      low: 10,
      high: null,
      unit: '°',
      context: 'treadmill',
      source: 'Common practice; Souza 2016',
      evidence: 'trade',
    });
  });
});

describe('defaults', () => {
  it('recognises the shipped default and a clinic change', () => {
    expect(isDefaultBand(hip, [hip])).toBe(true);
    expect(isDefaultBand({ ...hip, low: 12 }, [hip])).toBe(false);
    expect(isDefaultBand(hip, [])).toBe(false);
    expect(hasDefault('hip_extension_toe_off', [hip])).toBe(true);
    expect(hasDefault('cadence', [hip])).toBe(false);
  });

  it('sorts bands in measure order', () => {
    expect(sortBands([blankBand('cadence'), hip]).map((b) => b.key)).toEqual(['hip_extension_toe_off', 'cadence']);
  });
});

describe('unitOf', () => {
  it("gives each measure's own unit, which a new band starts with", () => {
    expect(unitOf('hip_extension_toe_off')).toBe('°');
    expect(unitOf('cadence')).toBe('steps/min');
    expect(unitOf('contact_time')).toBe('s');
    expect(blankBand('duty_factor').unit).toBe('%');
  });
});
