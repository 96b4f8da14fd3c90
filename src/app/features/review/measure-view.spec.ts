import type { Measure } from '../../../contracts/measures';
import { bandFlag, bandRange, footStrikeClass, formatMeasure, formatValue, groupMeasures, measureContext, stepsText } from './measure-view';

function measure(partial: Partial<Measure>): Measure {
  return {
    key: 'cadence',
    label: 'Cadence',
    unit: 'steps/min',
    side: null,
    event: null,
    status: 'ok',
    mean: 170,
    sd: 3,
    n: 8,
    values: [],
    derivation: '',
    ...partial,
  };
}

describe('groupMeasures', () => {
  it('sorts measures into the panel groups in order, left before right', () => {
    const groups = groupMeasures([
      measure({ key: 'cadence' }),
      measure({ key: 'hip_extension_toe_off', side: 'right', unit: '°' }),
      measure({ key: 'hip_extension_toe_off', side: 'left', unit: '°' }),
      measure({ key: 'trunk_lean', unit: '°' }),
    ]);
    expect(groups.map((g) => g.def.title)).toEqual(['Hip & pelvis', 'Trunk', 'Timing']);
    expect(groups[0].measures.map((m) => m.side)).toEqual(['left', 'right']);
  });

  it('says which reference hip extension uses and that 2D overstates it by the pelvic tilt', () => {
    const hip = groupMeasures([measure({ key: 'hip_extension_toe_off' })])[0];
    expect(hip.def.note).toContain('thigh (hip → knee) from vertical');
    expect(hip.def.note).toContain('overstates extension relative to the pelvis by about the pelvic anterior tilt');
  });
});

describe('formatting', () => {
  it('formats mean ± SD with the unit', () => {
    expect(formatMeasure(measure({ mean: 171.43, sd: 4.2, unit: 'steps/min' }))).toBe('171 ± 4 steps/min');
    expect(formatMeasure(measure({ mean: 22.521, sd: 1.26, unit: '°' }))).toBe('22.5 ± 1.3°');
    expect(formatMeasure(measure({ mean: 0.35, sd: 0.01, unit: 's' }))).toBe('0.350 ± 0.010 s');
    expect(formatMeasure(measure({ mean: 12, sd: 0, n: 1, unit: '°' }))).toBe('12.0°');
    expect(formatMeasure(measure({ status: 'not_enough_data', mean: null }))).toBe('Not enough data');
    expect(formatMeasure(measure({ mean: -3.04, sd: 0.5, unit: '°' }))).toBe('−3.0 ± 0.5°');
    expect(formatValue(-0.01, '°')).toBe('0.0°');
    expect(formatValue(null, '°')).toBe('—');
  });

  it('names side and event', () => {
    expect(measureContext({ side: 'left', event: 'toe_off' })).toBe('Left · Toe-off');
    expect(measureContext({ side: null, event: null })).toBe('Both sides');
  });

  it('flags fewer than 7 steps', () => {
    expect(stepsText({ n: 4, status: 'ok' })).toEqual({ text: 'n = 4 steps (fewer than 7: less reliable)', few: true });
    expect(stepsText({ n: 7, status: 'ok' })).toEqual({ text: 'n = 7 steps', few: false });
  });

  it('writes one- and two-sided bands', () => {
    expect(bandRange({ low: 13.8, high: 21.8, unit: '°' })).toBe('13.8–21.8°');
    expect(bandRange({ low: 10, high: null, unit: '°' })).toBe('≥ 10°');
    expect(bandRange({ low: null, high: 8, unit: 'cm' })).toBe('≤ 8 cm');
    expect(bandRange({ low: -0.8, high: 7.4, unit: '°' })).toBe('−0.8 to 7.4°');
  });

  it('flags positions with an icon and words', () => {
    const band = { key: 'cadence', low: 1, high: 2, unit: '', context: '', source: '', evidence: 'pub' } as const;
    expect(bandFlag({ band, position: 'below' })).toEqual({ icon: 'south', text: 'Below the reference band', outside: true });
    expect(bandFlag({ band, position: 'within' }).outside).toBe(false);
  });
});

describe('footStrikeClass (Mo et al. 2021 cut-offs [pub]: forefoot ≤ −0.8°, rearfoot ≥ 7.4°)', () => {
  it('classes the foot angle at initial contact', () => {
    expect(footStrikeClass(14.744)).toBe('rearfoot');
    expect(footStrikeClass(7.4)).toBe('rearfoot');
    expect(footStrikeClass(3)).toBe('midfoot');
    expect(footStrikeClass(-0.8)).toBe('forefoot');
    expect(footStrikeClass(null)).toBeNull();
  });
});
